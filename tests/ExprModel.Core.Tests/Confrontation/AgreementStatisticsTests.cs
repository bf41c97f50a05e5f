using ExprModel.Core.Confrontation;
using MathNet.Numerics.Statistics;

namespace ExprModel.Core.Tests.Confrontation;

public class AgreementStatisticsTests
{
    private static readonly double[] Recorded = [-71.3, -68.7, -62.8, -69.6, -66.0, -73.1, -64.4];

    [Fact]
    public void APerfectPredictionHasNoErrorNoBiasAndFullCorrelation()
    {
        var a = AgreementStatistics.Of("resting_potential", "mV", Recorded, Recorded);
        Assert.Equal(Recorded.Length, a.Cells);
        Assert.Equal(0, a.MeanAbsoluteError!.Value, 12);
        Assert.Equal(0, a.Bias!.Value, 12);
        Assert.Equal(1, a.PearsonR!.Value, 12);
        Assert.Equal(1, a.SpearmanR!.Value, 12);
    }

    [Fact]
    public void AShiftedPredictionHasTheShiftAsBiasAndError()
    {
        var shifted = Recorded.Select(x => x + 4.5).ToArray();
        var a = AgreementStatistics.Of("resting_potential", "mV", shifted, Recorded);
        Assert.Equal(4.5, a.Bias!.Value, 12);
        Assert.Equal(4.5, a.MeanAbsoluteError!.Value, 12);
        Assert.Equal(1, a.PearsonR!.Value, 12);
        // A prediction too low by the same amount: the bias changes sign, the error does not.
        var low = AgreementStatistics.Of("resting_potential", "mV", Recorded.Select(x => x - 4.5).ToArray(), Recorded);
        Assert.Equal(-4.5, low.Bias!.Value, 12);
        Assert.Equal(4.5, low.MeanAbsoluteError!.Value, 12);
    }

    [Fact]
    public void CorrelationsMatchTheirDefinitionsAndMathNet()
    {
        double[] predicted = [-70.0, -69.5, -60.2, -72.4, -65.1, -71.0, -66.3];
        var a = AgreementStatistics.Of("resting_potential", "mV", predicted, Recorded);
        // Pearson r by its definition: covariance over the product of the standard deviations.
        double mx = predicted.Average(), my = Recorded.Average();
        double sxy = predicted.Zip(Recorded, (x, y) => (x - mx) * (y - my)).Sum();
        double sxx = predicted.Sum(x => (x - mx) * (x - mx)), syy = Recorded.Sum(y => (y - my) * (y - my));
        Assert.Equal(sxy / Math.Sqrt(sxx * syy), a.PearsonR!.Value, 12);
        Assert.Equal(Correlation.Pearson(predicted, Recorded), a.PearsonR!.Value, 12);
        // Spearman r without ties: 1 - 6 sum d^2 / (n (n^2 - 1)) on the ranks (Spearman 1904).
        int[] Ranks(double[] v) => v.Select(x => v.Count(y => y < x) + 1).ToArray();
        var (rp, rr) = (Ranks(predicted), Ranks(Recorded));
        int n = predicted.Length;
        double d2 = rp.Zip(rr, (p, r) => (double)(p - r) * (p - r)).Sum();
        Assert.Equal(1 - 6 * d2 / (n * (n * n - 1.0)), a.SpearmanR!.Value, 12);
        // MAE and bias by hand.
        Assert.Equal(predicted.Zip(Recorded, (p, r) => Math.Abs(p - r)).Average(), a.MeanAbsoluteError!.Value, 12);
        Assert.Equal(predicted.Zip(Recorded, (p, r) => p - r).Average(), a.Bias!.Value, 12);
    }

    [Fact]
    public void RankCorrelationIsOneForAnyIncreasingRelationPearsonIsNot()
    {
        double[] recorded = [1, 2, 3, 4, 5, 6];
        var a = AgreementStatistics.Of("rheobase_absolute", "pA", recorded.Select(x => Math.Exp(x)).ToArray(), recorded);
        Assert.Equal(1, a.SpearmanR!.Value, 12);
        Assert.True(a.PearsonR < 0.95, $"Pearson r {a.PearsonR}");
    }

    [Fact]
    public void FewerThanThreeCellsOrNoSpreadGiveNoCorrelation()
    {
        var two = AgreementStatistics.Of("x", "mV", [1.0, 2.0], [1.5, 2.5]);
        Assert.Null(two.PearsonR);
        Assert.Null(two.SpearmanR);
        Assert.Equal(-0.5, two.Bias!.Value, 12);
        var flat = AgreementStatistics.Of("x", "mV", [3.0, 3.0, 3.0], [1.0, 2.0, 3.0]);
        Assert.Null(flat.PearsonR);
        Assert.Null(AgreementStatistics.SpreadOf([1.0, 2.0]));
        Assert.Equal(1.0, AgreementStatistics.SpreadOf([1.0, 2.0, 3.0])!.Value, 12); // sample SD of 1, 2, 3
        var none = AgreementStatistics.Of("x", "mV", [], []);
        Assert.Equal(0, none.Cells);
        Assert.Null(none.Bias);
    }
}
