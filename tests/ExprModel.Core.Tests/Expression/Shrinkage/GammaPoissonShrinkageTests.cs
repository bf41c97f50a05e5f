using Xunit.Abstractions;
using ExprModel.Core.Expression.Shrinkage;
using MathNet.Numerics.Distributions;

namespace ExprModel.Core.Tests.Expression.Shrinkage;

public class GammaPoissonShrinkageTests(ITestOutputHelper output)
{
    /// <summary>Counts from known per-cell rates: five groups, 48 cells each, library sizes log-normal around 40,000
    /// (sigma 0.45, as the demo survey), per-cell rates gamma-distributed around each group's level, Poisson sampling and
    /// extra dropout where the expected count is low (probability 0.3 / (1 + expected count)).</summary>
    private sealed record Simulated(double[][] TrueCpm, double[][] Counts, double[] Library, int[][] Groups);

    private static Simulated Simulate(int seed, int genes = 40, int groups = 5, int cellsPerGroup = 48)
    {
        var rng = new Random(seed);
        int n = groups * cellsPerGroup;
        var library = Enumerable.Range(0, n).Select(_ => LogNormal.Sample(rng, Math.Log(40000), 0.45)).ToArray();
        var members = Enumerable.Range(0, groups).Select(g => Enumerable.Range(g * cellsPerGroup, cellsPerGroup).ToArray()).ToArray();
        var truth = new double[genes][];
        var counts = new double[genes][];
        for (int k = 0; k < genes; k++)
        {
            truth[k] = new double[n];
            counts[k] = new double[n];
            double shape = 1.5 + 4 * rng.NextDouble(); // between-cell variation: coefficient of variation 0.45 to 0.8
            for (int g = 0; g < groups; g++)
            {
                double level = Math.Exp(Math.Log(3) + rng.NextDouble() * Math.Log(300)); // 3 to 900 CPM, log-uniform
                foreach (int i in members[g])
                {
                    double rate = level * Gamma.Sample(rng, shape, shape);
                    double expected = rate * library[i] / 1e6;
                    int count = Poisson.Sample(rng, expected);
                    truth[k][i] = rate;
                    counts[k][i] = rng.NextDouble() < 0.3 / (1 + expected) ? 0 : count;
                }
            }
        }
        return new Simulated(truth, counts, library, members);
    }

    private static double LogError(double estimate, double truth) => Math.Pow(Math.Log(1 + estimate) - Math.Log(1 + truth), 2);

    [Theory]
    [InlineData(20261201)]
    [InlineData(7)]
    public void ShrunkEstimatesAreCloserToTheTrueRatesThanRawCpm(int seed)
    {
        var s = Simulate(seed);
        double raw = 0, shrunk = 0, rawZeros = 0, shrunkZeros = 0;
        int n = 0, zeros = 0;
        for (int k = 0; k < s.Counts.Length; k++)
            foreach (var members in s.Groups)
            {
                var prior = GammaPoissonShrinkage.EstimatePrior(s.Counts[k], s.Library, members);
                foreach (int i in members)
                {
                    double rawCpm = s.Counts[k][i] / s.Library[i] * 1e6;
                    double est = prior.PosteriorMeanCpm(s.Counts[k][i], s.Library[i]);
                    raw += LogError(rawCpm, s.TrueCpm[k][i]);
                    shrunk += LogError(est, s.TrueCpm[k][i]);
                    n++;
                    if (s.Counts[k][i] == 0)
                    {
                        rawZeros += LogError(0, s.TrueCpm[k][i]);
                        shrunkZeros += LogError(est, s.TrueCpm[k][i]);
                        zeros++;
                    }
                }
            }
        // Error measure: mean squared error of ln(1 + CPM) against the true rate, over every gene and cell.
        double rawMse = raw / n, shrunkMse = shrunk / n;
        output.WriteLine($"seed {seed}: MSE of ln(1+CPM) raw {rawMse:F4}, shrunk {shrunkMse:F4}; at {zeros} zero counts raw {rawZeros / zeros:F4}, " +
            $"shrunk {shrunkZeros / zeros:F4}");
        Assert.True(shrunkMse < 0.7 * rawMse, $"MSE of ln(1+CPM): raw {rawMse:F3}, shrunk {shrunkMse:F3}");
        // Where a cell reads zero the raw estimate is worst; shrinkage helps most there.
        Assert.True(zeros > 100, $"{zeros} zero counts");
        Assert.True(shrunkZeros / zeros < 0.5 * rawZeros / zeros, $"zero counts: raw {rawZeros / zeros:F3}, shrunk {shrunkZeros / zeros:F3}");
    }

    [Fact]
    public void TheMomentEstimatorRecoversAKnownGammaPrior()
    {
        // Many cells from one gamma prior (mean 40 CPM, shape 2.5: variance 640 CPM^2): the method-of-moments estimates are
        // consistent, so with 20,000 cells they lie within a few per cent (sampling error, not a published value).
        var rng = new Random(11);
        int n = 20000;
        var library = Enumerable.Range(0, n).Select(_ => LogNormal.Sample(rng, Math.Log(40000), 0.45)).ToArray();
        var counts = library.Select(l => (double)Poisson.Sample(rng, 40 * Gamma.Sample(rng, 2.5, 2.5) * l / 1e6)).ToArray();
        var prior = GammaPoissonShrinkage.EstimatePrior(counts, library, Enumerable.Range(0, n).ToArray());
        Assert.Equal(40, prior.MeanCpm, 40 * 0.02);
        Assert.Equal(640, prior.RateVariance, 640 * 0.1);
        Assert.Equal(2.5, prior.Shape, 2.5 * 0.1);
        Assert.Equal(n, prior.Cells);
    }

    [Fact]
    public void ThePosteriorMeanIsTheConjugateUpdate()
    {
        // Gamma(a, b) prior and a Poisson count with exposure s: posterior Gamma(a + y, b + s), mean (a + y) / (b + s).
        var prior = new GammaPoissonPrior(MeanCpm: 50, RateVariance: 500, Cells: 10);
        double a = prior.Shape, b = prior.RatePerMillion;
        Assert.Equal(5, a, 12);
        Assert.Equal(0.1, b, 12);
        foreach (var (y, library) in new[] { (0.0, 40000.0), (3.0, 25000.0), (12.0, 90000.0) })
            Assert.Equal((y + a) / (library / 1e6 + b), prior.PosteriorMeanCpm(y, library), 9);
        // A huge library leaves the cell's own CPM; an empty one gives the prior mean.
        Assert.Equal(120, prior.PosteriorMeanCpm(120e3, 1e9), 1);
        Assert.Equal(50, prior.PosteriorMeanCpm(0, 0), 12);
    }

    [Fact]
    public void CountsThatVaryNoMoreThanCountingNoiseShrinkFullyToTheMean()
    {
        // Every cell has exactly its expected count at 100 CPM: no spread beyond Poisson, so the variance is set to zero.
        double[] library = [20000, 40000, 60000, 80000];
        double[] counts = library.Select(l => 100 * l / 1e6).ToArray();
        var prior = GammaPoissonShrinkage.EstimatePrior(counts, library, [0, 1, 2, 3]);
        Assert.Equal(100, prior.MeanCpm, 9);
        Assert.Equal(0, prior.RateVariance);
        Assert.Equal(double.PositiveInfinity, prior.Shape);
        Assert.Equal(100, prior.PosteriorMeanCpm(0, 40000), 9);
        // A gene no cell of the group expresses stays at zero.
        var silent = GammaPoissonShrinkage.EstimatePrior([0, 0, 0, 0], library, [0, 1, 2, 3]);
        Assert.Equal(0, silent.PosteriorMeanCpm(0, 40000));
    }
}
