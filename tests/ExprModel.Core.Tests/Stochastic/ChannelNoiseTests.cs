using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;
using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Tests.Stochastic;

public class ChannelNoiseTests
{
    private static double[] Unitary(CompiledCell cell, double scale) =>
        ChannelNoise.UnitaryConductances(cell.Model, e => TestCatalog.Catalog.UnitaryConductances.For(e).ConductancePs * scale);

    [Fact]
    public void Channel_count_is_density_times_area_over_unitary_conductance()
    {
        // 120 mS/cm2 = 1.2e-3 S/cm2 over 1000 um2 = 1e-5 cm2 gives 1.2e-8 S; / 18 pS = 666.7.
        Assert.Equal(667, ChannelNoise.ChannelCount(120, 1000, 18 * 100));
        var cell = TestCatalog.Preset("hh1952");
        var trace = ChannelNoise.Run(cell, new NoCurrent(), 5, new ChannelNoiseSettings { UnitaryConductancesPs = Unitary(cell, 1) });
        Assert.Equal(ChannelNoise.ChannelCount(cell.Model.Channels[0].EffectiveDensityMsPerCm2, cell.Model.Geometry.AreaUm2, 18), trace.ChannelCounts[0]);
        Assert.Equal(0, trace.ChannelCounts[2]);
    }

    [Fact]
    public void As_the_channel_count_grows_spike_counts_approach_the_deterministic_models()
    {
        var cell = TestCatalog.Preset("hh1952");
        var stim = new StepCurrent(20, 200, 10);
        int deterministic = Simulator.Run(cell, stim, 240).SpikeTimesMs.Count;
        double Deviation(double scale) => Enumerable.Range(0, 4).Average(seed =>
            Math.Abs(ChannelNoise.Run(cell, stim, 240, new ChannelNoiseSettings { UnitaryConductancesPs = Unitary(cell, scale), Seed = seed, RecordEvery = 0 })
                .SpikeTimesMs.Count - deterministic));
        double few = Deviation(300), many = Deviation(0.01);
        // With about 10^7 sodium channels the noise is negligible: the count may differ by one spike at most
        // (first-order voltage step in the noisy loop against the deterministic second-order loop).
        Assert.True(many <= 1, $"{many} spikes off the deterministic {deterministic} with many channels");
        Assert.True(few >= many, $"few channels {few}, many {many}");
    }

    [Fact]
    public void Normal_approximation_matches_exact_draws_on_a_small_cell()
    {
        // A 100 um2 squid-axon patch of membrane fires spontaneously from channel noise. Same model, exact binomial
        // draws against the default (normal above an expected count of 25): spontaneous rates within 4 standard errors
        // (Poisson counts).
        var model = TestCatalog.Preset("hh1952").Model;
        var cell = new CompiledCell(model with { Geometry = new Geometry { AreaUm2 = 100 } });
        var unitary = Unitary(cell, 1);
        const double ms = 1000;
        const int trials = 6;
        var exactDraws = new ChannelNoiseSettings
        {
            UnitaryConductancesPs = unitary,
            ExactUpToMean = double.PositiveInfinity,
            Seed = 1,
            DiffusionFromChannels = int.MaxValue,
        };
        double exact = NoiseReadouts.SpontaneousRateHz(cell, exactDraws, ms, trials);
        double approx = NoiseReadouts.SpontaneousRateHz(cell, exactDraws with { ExactUpToMean = 25, Seed = 1001 }, ms, trials);
        double n = trials * ms / 1000;
        double se = Math.Sqrt(exact / n + approx / n);
        Assert.True(exact > 0, "the small cell should fire spontaneously");
        Assert.InRange(approx - exact, -4 * se, 4 * se);
    }

    [Fact]
    public void Same_seed_same_spikes_and_firing_probability_rises_with_amplitude()
    {
        var cell = TestCatalog.Preset("hh1952");
        var s = new ChannelNoiseSettings { UnitaryConductancesPs = Unitary(cell, 30), Seed = 4, RecordEvery = 0 };
        var stim = new StepCurrent(10, 50, 8);
        Assert.Equal(ChannelNoise.Run(cell, stim, 80, s).SpikeTimesMs, ChannelNoise.Run(cell, stim, 80, s).SpikeTimesMs);
        var curve = NoiseReadouts.FiringProbability(cell, s, [0.0, 40.0], 1, 12);
        Assert.True(curve[1].Probability > curve[0].Probability);
        var jitter = NoiseReadouts.Jitter(cell, s, 20, 30, 8);
        Assert.True(jitter.LatenciesMs.Count >= 2 && jitter.StandardDeviationMs > 0);
    }

    [Fact]
    public void A_small_cell_fires_like_the_continuous_time_exact_simulation()
    {
        // A 10 um2 squid-axon membrane (about 670 sodium and 180 potassium channels) fires spontaneously from channel
        // noise. Binomial channel-number tracking at the default 25 us step against continuous-time exact simulation
        // (Gillespie 1977; WholeCellGillespie): spike count and mean membrane potential per trial (20 ms settling, then
        // 250 ms) over independent seeded trials of each; the means agree within 4 standard errors of their difference,
        // each standard error from its own trials' spread (sd / sqrt(trials)).
        var model = TestCatalog.Preset("hh1952").Model;
        var cell = new CompiledCell(model with { Geometry = new Geometry { AreaUm2 = 10 } });
        var unitary = Unitary(cell, 1);
        const double settle = 20, duration = 250;
        const int trials = 12;
        var exact = Enumerable.Range(0, trials).Select(t => WholeCellGillespie.Simulate(cell, unitary, settle, duration, 100 + t)).ToArray();
        var binomial = Enumerable.Range(0, trials).Select(t =>
        {
            var trace = ChannelNoise.Run(cell, new NoCurrent(), settle + duration,
                new ChannelNoiseSettings { UnitaryConductancesPs = unitary, Seed = 500 + t, RecordEvery = 1, DiffusionFromChannels = int.MaxValue });
            var kept = trace.TimeMs.Select((time, j) => (time, j)).Where(p => p.time > settle).Select(p => trace.VoltageMv[p.j]).ToArray();
            return new WholeCellGillespie.Run(trace.SpikeTimesMs.Count(s => s > settle), kept.Average());
        }).ToArray();
        Assert.True(exact.Average(r => r.Spikes) >= 3, "the small cell should fire spontaneously");
        AssertSameMean(exact.Select(r => (double)r.Spikes).ToArray(), binomial.Select(r => (double)r.Spikes).ToArray(), "spikes per trial");
        AssertSameMean(exact.Select(r => r.MeanVoltageMv).ToArray(), binomial.Select(r => r.MeanVoltageMv).ToArray(), "mean V (mV)");
    }

    [Fact]
    public void Diffusion_fires_like_binomial_tracking_on_a_small_cell()
    {
        // A 30 um2 squid-axon membrane (2,000 sodium and 540 potassium channels, both at or above the default diffusion
        // threshold of 500) fires spontaneously from channel noise. Diffusion approximation for every type against binomial
        // tracking for every type (itself checked against continuous-time exact simulation above): spikes per trial and mean
        // V (20 ms settling, then 500 ms; 16 seeded trials each) agree within 4 standard errors of the difference.
        // Measured when written: spikes 14.1 (binomial) vs 13.8 (diffusion) per trial, 4 SE about 2.8.
        var model = TestCatalog.Preset("hh1952").Model;
        var cell = new CompiledCell(model with { Geometry = new Geometry { AreaUm2 = 30 } });
        var binomial = new ChannelNoiseSettings { UnitaryConductancesPs = Unitary(cell, 1), Seed = 100, RecordEvery = 1, DiffusionFromChannels = int.MaxValue };
        var diffusion = binomial with { Seed = 900, DiffusionFromChannels = 1 };
        Assert.Equal([ChannelNoiseMethod.Diffusion, ChannelNoiseMethod.Diffusion, ChannelNoiseMethod.Deterministic],
            ChannelNoise.Run(cell, new NoCurrent(), 1, diffusion).Methods);
        const double settle = 20, duration = 500;
        const int trials = 16;
        WholeCellGillespie.Run[] Trials(ChannelNoiseSettings s) => Enumerable.Range(0, trials).Select(t =>
        {
            var trace = ChannelNoise.Run(cell, new NoCurrent(), settle + duration, s with { Seed = s.Seed + t });
            var kept = trace.TimeMs.Select((time, j) => (time, j)).Where(p => p.time > settle).Select(p => trace.VoltageMv[p.j]).ToArray();
            return new WholeCellGillespie.Run(trace.SpikeTimesMs.Count(x => x > settle), kept.Average());
        }).ToArray();
        var exact = Trials(binomial);
        var approx = Trials(diffusion);
        Assert.True(exact.Average(r => r.Spikes) >= 3, "the small cell should fire spontaneously");
        AssertSameMean(exact.Select(r => (double)r.Spikes).ToArray(), approx.Select(r => (double)r.Spikes).ToArray(), "spikes per trial");
        AssertSameMean(exact.Select(r => r.MeanVoltageMv).ToArray(), approx.Select(r => r.MeanVoltageMv).ToArray(), "mean V (mV)");
    }

    [Fact]
    public void Diffusion_gives_the_firing_probability_of_binomial_tracking()
    {
        // A 300 um2 squid-axon membrane (20,000 sodium, 5,400 potassium channels): a 1 ms pulse of 6 uA/cm2 fires in about a
        // third of the trials. Firing probabilities of the two methods over 300 seeded trials each agree within 4 standard
        // errors of the difference of two binomial proportions. Measured when written (200 trials): 0.33 vs 0.34; at 5 and
        // 8 uA/cm2 0.125 vs 0.175 and 0.74 vs 0.75.
        var model = TestCatalog.Preset("hh1952").Model;
        var cell = new CompiledCell(model with { Geometry = new Geometry { AreaUm2 = 300 } });
        var binomial = new ChannelNoiseSettings { UnitaryConductancesPs = Unitary(cell, 1), Seed = 100, DiffusionFromChannels = int.MaxValue };
        const int trials = 300;
        double exact = NoiseReadouts.FiringProbability(cell, binomial, [6.0], 1, trials)[0].Probability;
        double approx = NoiseReadouts.FiringProbability(cell, binomial with { Seed = 900, DiffusionFromChannels = 1 }, [6.0], 1, trials)[0].Probability;
        double pooled = (exact + approx) / 2, se = Math.Sqrt(2 * pooled * (1 - pooled) / trials);
        Assert.InRange(exact, 0.1, 0.9);
        Assert.True(Math.Abs(approx - exact) <= 4 * se, $"binomial {exact:F3}, diffusion {approx:F3}, 4 SE = {4 * se:F3}");
    }

    private static void AssertSameMean(double[] a, double[] b, string what)
    {
        static double Se(double[] x)
        {
            double m = x.Average();
            return Math.Sqrt(x.Sum(v => (v - m) * (v - m)) / (x.Length - 1) / x.Length);
        }
        double diff = b.Average() - a.Average(), se = Math.Sqrt(Se(a) * Se(a) + Se(b) * Se(b));
        Assert.True(Math.Abs(diff) <= 4 * se, $"{what}: reference {a.Average():G4}, method {b.Average():G4}, 4 SE = {4 * se:G3}");
    }
}
