using MathNet.Numerics.Statistics;

namespace ExprModel.Core.Confrontation;

/// <summary>Statistics of predicted against recorded values (correlations from MathNet.Numerics).</summary>
public static class AgreementStatistics
{
    /// <summary>Fewest pairs for a correlation or a spread: with two, r is always +-1 and says nothing.</summary>
    public const int MinimumCells = 3;

    public static ReadoutAgreement Of(string readout, string unit, IReadOnlyList<double> predicted, IReadOnlyList<double> recorded)
    {
        if (predicted.Count != recorded.Count) throw new ArgumentException("predicted and recorded differ in length.");
        int n = predicted.Count;
        if (n == 0) return new ReadoutAgreement(readout, unit, 0, null, null, null, null);
        double mae = 0, bias = 0;
        for (int i = 0; i < n; i++)
        {
            mae += Math.Abs(predicted[i] - recorded[i]);
            bias += predicted[i] - recorded[i];
        }
        double? pearson = null, spearman = null;
        if (n >= MinimumCells)
        {
            pearson = Finite(Correlation.Pearson(predicted, recorded));
            spearman = Finite(Correlation.Spearman(predicted, recorded));
        }
        return new ReadoutAgreement(readout, unit, n, pearson, spearman, mae / n, bias / n);
    }

    /// <summary>Sample standard deviation (n - 1), or null with fewer than <see cref="MinimumCells"/> values.</summary>
    public static double? SpreadOf(IReadOnlyList<double> values) => values.Count >= MinimumCells ? values.StandardDeviation() : null;

    private static double? Finite(double x) => double.IsFinite(x) ? x : null;
}
