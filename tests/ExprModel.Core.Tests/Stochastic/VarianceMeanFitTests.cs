using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Tests.Stochastic;

public class VarianceMeanFitTests
{
    [Fact]
    public void Recovers_unitary_current_and_count_from_an_exact_parabola()
    {
        // sigma^2 = i I - I^2 / N (binomial; common practice) with i = -1.5 pA, N = 200.
        double i = -1.5, n = 200;
        var mean = Enumerable.Range(0, 50).Select(k => n * i * k / 60.0).ToArray();
        var variance = mean.Select(m => i * m - m * m / n).ToArray();
        var fit = VarianceMeanFit.Fit(mean, variance)!;
        Assert.Equal(i, fit.UnitaryCurrentPa, 9);
        Assert.Equal(n, fit.ChannelCount, 6);
    }

    [Fact]
    public void Too_few_points_give_no_fit() => Assert.Null(VarianceMeanFit.Fit([1.0, 2.0], [0.5, 0.7]));
}
