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
        var exactDraws = new ChannelNoiseSettings { UnitaryConductancesPs = unitary, ExactUpToMean = double.PositiveInfinity, Seed = 1 };
        double exact = NoiseReadouts.SpontaneousRateHz(cell, exactDraws, ms, trials);
        double approx = NoiseReadouts.SpontaneousRateHz(cell, new ChannelNoiseSettings { UnitaryConductancesPs = unitary, Seed = 1001 }, ms, trials);
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
}
