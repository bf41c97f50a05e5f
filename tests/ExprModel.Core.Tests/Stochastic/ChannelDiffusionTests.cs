using ExprModel.Core.Simulation;
using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Tests.Stochastic;

public class ChannelDiffusionTests
{
    // A sodium-like channel m^3 h at one fixed voltage: per 25 us step each m subunit relaxes with e_m = exp(-dt/0.5 ms),
    // each h subunit with e_h = exp(-dt/4 ms), toward x_m = 0.4 and x_h = 0.5 (opening x (1 - e), closing (1 - x)(1 - e)).
    private const double Dt = 0.025, Xm = 0.4, Xh = 0.5;
    private static readonly double Em = Math.Exp(-Dt / 0.5), Eh = Math.Exp(-Dt / 4);
    private static readonly double[] Opening = [Xm * (1 - Em), Xh * (1 - Eh)];
    private static readonly double[] Closing = [(1 - Xm) * (1 - Em), (1 - Xh) * (1 - Eh)];
    private static readonly int[] Gates = [0, 1];
    private static readonly MarkovScheme Scheme = new([3, 1], [false, false]);

    /// <summary>
    /// Stationary autocovariance of the open fraction of N channels with independent subunits after n steps (derived in the
    /// guide and in ChannelDiffusion): (1/N) [prod_i (x_i^2 + x_i (1 - x_i) e_i^n)^p_i - prod_i x_i^(2 p_i)]. At lag 0 it
    /// is p (1 - p) / N, the binomial variance of the open count over N^2 (common practice).
    /// </summary>
    private static double ClosedForm(int channels, int lag)
    {
        double m = Xm * Xm + Xm * (1 - Xm) * Math.Pow(Em, lag), h = Xh * Xh + Xh * (1 - Xh) * Math.Pow(Eh, lag);
        return (m * m * m * h - Math.Pow(Xm, 6) * Xh * Xh) / channels;
    }

    [Fact]
    public void Mode_weights_add_up_to_the_binomial_variance()
    {
        // p (1 - p) / N with p = x_m^3 x_h: the binomial variance of the open count over N^2 (common practice).
        var type = new ChannelDiffusion(Scheme, 1, [Xm, Xh]);
        var spread = new double[type.ModeCount];
        type.StationarySpread(spread);
        double p = Xm * Xm * Xm * Xh;
        Assert.Equal(7, type.ModeCount);
        Assert.Equal(p * (1 - p), spread.Sum(s => s * s), 12);
    }

    [Fact]
    public void At_fixed_voltage_the_open_fraction_has_the_closed_form_autocovariance_like_the_exact_chain()
    {
        // Diffusion (OU modes) and exact binomial tracking of the same 1,000 channels for 12 s each; the autocovariance of
        // the open fraction at lags 0, 0.5, 2 and 8 ms (0, 20, 80, 320 steps) about the known mean p is estimated in 24
        // batches of 0.5 s; each method's mean over batches must lie within 4 standard errors (batch spread / sqrt(24)) of the
        // closed form. The exact chain checks the closed form itself; a wrong mode weight or rate (or the single-gate
        // "noisy gate" shortcut) moves the lag-0 or lag-2 ms values by far more than the band.
        const int channels = 1000, batches = 24, batchSteps = 20_000;
        int[] lags = [0, 20, 80, 320];
        double p = Xm * Xm * Xm * Xh;
        var rng = new StochasticRandom(5);
        var bank = new DiffusionBank([(new ChannelDiffusion(Scheme, channels, [Xm, Xh]), Gates, null)], rng);
        var population = new ChannelPopulation(Scheme, Stationary(channels, rng));
        var opening = Opening;
        var closing = Closing;
        var diffusion = Autocovariances(() =>
        {
            bank.Step(0, opening, closing, rng);
            return bank.OpenFraction(0);
        }, p, lags, batches, batchSteps);
        var exact = Autocovariances(() =>
        {
            population.Move(0, opening[0], closing[0], rng, double.PositiveInfinity);
            population.Move(1, opening[1], closing[1], rng, double.PositiveInfinity);
            return population.OpenCount / (double)channels;
        }, p, lags, batches, batchSteps);
        for (int l = 0; l < lags.Length; l++)
        {
            double expected = ClosedForm(channels, lags[l]);
            foreach (var (name, series) in new[] { ("diffusion", diffusion[l]), ("exact chain", exact[l]) })
            {
                double mean = series.Average(), se = Math.Sqrt(series.Sum(x => (x - mean) * (x - mean)) / (batches - 1) / batches);
                Assert.True(Math.Abs(mean - expected) <= 4 * se,
                    $"{name}, lag {lags[l] * Dt} ms: {mean:E4} against the closed form {expected:E4} (4 SE = {4 * se:E2})");
            }
        }
    }

    [Fact]
    public void Tabulated_coefficients_are_the_per_step_ones_at_the_grid_points()
    {
        // The squid-axon sodium channel's table: at a 0.1 mV grid point (-50 mV) E and A are what Coefficients gives for
        // that point's subunit probabilities in the rate table (same numbers, so equal to rounding).
        var cell = TestCatalog.Preset("hh1952");
        var table = cell.Kinetics.TableFor(Dt);
        var scheme = new MarkovScheme([3, 1], [false, false]);
        int[] gates = [0, 1];
        var tabulated = ChannelDiffusion.Tabulate(scheme, table, gates);
        int point = (int)Math.Round((-50 - RateTable.MinMv) / ChannelDiffusion.GridMv);
        int j = 2 * (int)Math.Round((-50 - RateTable.MinMv) / RateTable.ResolutionMv);
        var opening = gates.Select(g => table.Data[g]![j + 1]).ToArray();
        var closing = gates.Select(g => 1 - table.Data[g]![j] - table.Data[g]![j + 1]).ToArray();
        var e = new double[7];
        var a = new double[7];
        new ChannelDiffusion(scheme, 1, [0.5, 0.5]).Coefficients(gates, opening, closing, e, a);
        for (int m = 0; m < 7; m++)
        {
            Assert.Equal(e[m], tabulated[point * 14 + m], 12);
            Assert.Equal(a[m], tabulated[point * 14 + 7 + m], 12);
        }
    }

    [Fact]
    public void Mode_coefficients_are_the_expanded_autocovariance_terms()
    {
        // Mode k = (k_m, k_h): E = e_m^k_m e_h^k_h, weight C(3, k_m) x_m^(6 - k_m) (1 - x_m)^k_m x_h^(2 - k_h) (1 - x_h)^k_h,
        // A = sqrt(weight (1 - E^2)) (the exact OU step), written out here term by term.
        var type = new ChannelDiffusion(Scheme, 1, [Xm, Xh]);
        var e = new double[7];
        var a = new double[7];
        type.Coefficients(Gates, Opening, Closing, e, a);
        for (int m = 0; m < 7; m++)
        {
            int km = Scheme.OpenSubunits(m + 1, 0), kh = Scheme.OpenSubunits(m + 1, 1);
            double em = Math.Pow(Em, km) * Math.Pow(Eh, kh);
            double w = MarkovScheme.Choose(3, km) * Math.Pow(Xm, 6 - km) * Math.Pow(1 - Xm, km) * Math.Pow(Xh, 2 - kh) * Math.Pow(1 - Xh, kh);
            Assert.Equal(em, e[m], 12);
            Assert.Equal(Math.Sqrt(w * (1 - em * em)), a[m], 12);
        }
    }

    private static int[] Stationary(int channels, StochasticRandom rng)
    {
        var counts = new int[Scheme.StateCount];
        var occupancy = Scheme.StationaryOccupancy([Xm, Xh]);
        for (int c = 0; c < channels; c++)
        {
            double u = rng.NextDouble();
            int s = 0;
            while (s < occupancy.Length - 1 && (u -= occupancy[s]) >= 0) s++;
            counts[s]++;
        }
        return counts;
    }

    /// <summary>Per lag, the autocovariance about <paramref name="mean"/> in each batch (series restarted per batch after a lag's run-in).</summary>
    private static double[][] Autocovariances(Func<double> step, double mean, int[] lags, int batches, int batchSteps)
    {
        int longest = lags.Max();
        var result = lags.Select(_ => new double[batches]).ToArray();
        var history = new double[longest + 1];
        for (int i = 0; i < 4 * longest; i++) step();
        for (int b = 0; b < batches; b++)
        {
            var sums = new double[lags.Length];
            for (int s = 0; s < batchSteps; s++)
            {
                double x = step() - mean;
                history[s % (longest + 1)] = x;
                for (int l = 0; l < lags.Length; l++)
                {
                    if (s >= lags[l]) sums[l] += x * history[(s - lags[l]) % (longest + 1)];
                }
            }
            for (int l = 0; l < lags.Length; l++) result[l][b] = sums[l] / (batchSteps - lags[l]);
        }
        return result;
    }
}
