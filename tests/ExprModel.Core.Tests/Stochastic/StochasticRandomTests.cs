using ExprModel.Core.Stochastic;
using MathNet.Numerics.Distributions;

namespace ExprModel.Core.Tests.Stochastic;

public class StochasticRandomTests
{
    [Fact]
    public void Same_seed_and_stream_give_the_same_numbers_and_other_streams_differ()
    {
        var a = new StochasticRandom(42, 3);
        var b = new StochasticRandom(42, 3);
        var c = new StochasticRandom(42, 4);
        var xa = Enumerable.Range(0, 100).Select(_ => a.NextBits()).ToArray();
        Assert.Equal(xa, Enumerable.Range(0, 100).Select(_ => b.NextBits()).ToArray());
        Assert.NotEqual(xa, Enumerable.Range(0, 100).Select(_ => c.NextBits()).ToArray());
    }

    [Theory]
    [InlineData(10, 0.3)]
    [InlineData(200, 0.05)]
    [InlineData(5000, 0.4)]
    [InlineData(40, 0.97)]
    public void Binomial_counts_have_the_binomial_mean_and_variance(int n, double p)
    {
        // Reference: MathNet.Numerics' Binomial distribution. Tolerances: 5 standard errors of the sample mean and
        // of the sample variance (var of s^2 about 2 sigma^4 / m for large m).
        var rng = new StochasticRandom(7);
        const int m = 100_000;
        var x = Enumerable.Range(0, m).Select(_ => (double)rng.NextBinomial(n, p)).ToArray();
        var reference = new Binomial(p, n);
        double mean = x.Average(), variance = x.Sum(v => (v - mean) * (v - mean)) / (m - 1);
        Assert.InRange(mean, reference.Mean - 5 * reference.StdDev / Math.Sqrt(m), reference.Mean + 5 * reference.StdDev / Math.Sqrt(m));
        double varSe = reference.Variance * Math.Sqrt(2.0 / m);
        Assert.InRange(variance, reference.Variance - 5 * varSe - 0.05, reference.Variance + 5 * varSe + 0.05);
        Assert.All(x, v => Assert.InRange(v, 0, n));
    }
}
