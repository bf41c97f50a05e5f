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

    [Theory]
    [InlineData(1000, 0.003, 25.0)]   // mean 3: inversion
    [InlineData(200, 0.075, 25.0)]    // mean 15: transformed rejection
    [InlineData(40, 0.3, 25.0)]       // mean 12 with few trials: transformed rejection near its lower limit
    [InlineData(100, 0.6, double.PositiveInfinity)]      // flipped to 1 - p: mean 40, rejection
    [InlineData(100_000, 0.004, double.PositiveInfinity)] // mean 400, rejection
    public void Exact_binomial_draws_follow_the_binomial_pmf(int n, double p, double exactUpToMean)
    {
        // Chi-square goodness of fit against MathNet.Numerics' Binomial pmf over 400,000 seeded draws, bins pooled until
        // each expects at least 20; the statistic must stay below the chi-square quantile at 1 - 1e-4 (a correct sampler
        // fails this one time in 10,000 seeds, and this seed is fixed).
        var rng = new StochasticRandom(11);
        const int m = 400_000;
        var counts = new Dictionary<int, int>();
        for (int i = 0; i < m; i++)
        {
            int k = rng.NextBinomial(n, p, exactUpToMean);
            counts[k] = counts.GetValueOrDefault(k) + 1;
        }
        var reference = new Binomial(p, n);
        double chi = 0, expected = 0, observed = 0, below = 0;
        int bins = 0;
        for (int k = 0; k <= n; k++)
        {
            double pk = reference.Probability(k);
            below += pk;
            expected += m * pk;
            observed += counts.GetValueOrDefault(k);
            bool last = k == n;
            if (expected >= 20 && m * (1 - below) >= 20 || last)
            {
                chi += (observed - expected) * (observed - expected) / Math.Max(expected, 1e-300);
                bins++;
                expected = observed = 0;
            }
        }
        double limit = ChiSquared.InvCDF(bins - 1, 1 - 1e-4);
        Assert.True(chi < limit, $"chi-square {chi:F1} over {bins} bins (limit {limit:F1})");
    }

    [Fact]
    public void Normal_draws_follow_the_standard_normal_including_the_tail()
    {
        // Kolmogorov-Smirnov distance to MathNet.Numerics' standard normal CDF over 400,000 seeded draws below the
        // asymptotic 0.1 % critical value 1.95 / sqrt(n) (common practice); the fraction beyond the ziggurat's tail start
        // (about 3.654) within 4 binomial standard errors of 2 (1 - Phi(r)).
        var rng = new StochasticRandom(5);
        const int m = 400_000;
        var x = new double[m];
        for (int i = 0; i < m; i++) x[i] = rng.NextNormal();
        Array.Sort(x);
        double d = 0;
        for (int i = 0; i < m; i++)
        {
            double f = Normal.CDF(0, 1, x[i]);
            d = Math.Max(d, Math.Max(f - (double)i / m, (i + 1.0) / m - f));
        }
        Assert.True(d < 1.95 / Math.Sqrt(m), $"KS distance {d:G3}");
        double r = NormalZiggurat.TailStart, tail = 2 * (1 - Normal.CDF(0, 1, r));
        double beyond = x.Count(v => Math.Abs(v) > r) / (double)m, se = Math.Sqrt(tail * (1 - tail) / m);
        Assert.InRange(beyond, tail - 4 * se, tail + 4 * se);
        Assert.InRange(r, 3.6, 3.7);
    }
}
