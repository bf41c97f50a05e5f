using ExprModel.Core.Analysis;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>
/// The adaptation-mechanism read-outs on published presets with and without an M-type potassium channel or a slowly
/// inactivating persistent sodium channel (common practice, DOMAIN.md: the M-current builds up over a train and deepens the
/// after-hyperpolarisation; persistent / slowly inactivating sodium raises the threshold), and on a synthetic train.
/// </summary>
public sealed class AdaptationMechanismsTests
{
    private static readonly Lazy<MechanismReport> WithM = new(() => AdaptationMechanisms.Measure(TestCatalog.Preset("cortex-rs2008")));
    private static readonly Lazy<MechanismReport> WithoutM = new(() => AdaptationMechanisms.Measure(Variant(null)));
    private static readonly Lazy<MechanismReport> WithNaP = new(() => AdaptationMechanisms.Measure(Variant(
        new ChannelDocument { Entry = "nap-prebotc-butera1999", Version = 1, DensityMsPerCm2 = 0.1, ReversalMv = 50 })));

    /// <summary>The regular-spiking preset of Pospischil et al. 2008 without its M-current, optionally with another channel.</summary>
    private static CompiledCell Variant(ChannelDocument? extra)
    {
        var rs = TestCatalog.Catalog.Preset("cortex-rs2008");
        var channels = rs.Channels.Where(c => !c.Entry.StartsWith("kv7-m", StringComparison.Ordinal)).ToList();
        Assert.Equal(rs.Channels.Count - 1, channels.Count);
        if (extra is not null) channels.Add(extra);
        return new CompiledCell(TestCatalog.Catalog.BuildCell(rs with { Channels = channels }));
    }

    [Fact]
    public void M_current_builds_up_over_the_train_and_deepens_the_after_hyperpolarisation()
    {
        var with = WithM.Value;
        var without = WithoutM.Value;
        Assert.True(with.Spikes.Count >= 10, $"{with.Spikes.Count} spikes");
        Assert.Equal("kv7-m-yamada", with.BuildingUpChannel);
        int m = with.ChannelLabels.ToList().IndexOf("kv7-m-yamada");
        var ramps = with.Spikes.Where(s => s.RampCurrentsUaPerCm2 is not null).Select(s => s.RampCurrentsUaPerCm2![m]).ToArray();
        Assert.True(ramps[^1] > 2 * ramps[0], $"M-current between spikes {ramps[0]:G3} -> {ramps[^1]:G3} uA/cm2");
        // The trough falls and the depth below threshold grows with the M-current, more than without it.
        Assert.True(with.Spikes[^2].TroughMv < with.Spikes[0].TroughMv - 0.3, $"troughs {with.Spikes[0].TroughMv} -> {with.Spikes[^2].TroughMv}");
        Assert.True(with.AfterHyperpolarisationChangeMv > without.AfterHyperpolarisationChangeMv + 0.2,
            $"AHP change with M {with.AfterHyperpolarisationChangeMv} mV, without {without.AfterHyperpolarisationChangeMv} mV");
        Assert.True(with.AfterHyperpolarisationSlopeMvPerSpike > 0);
        Assert.NotEqual("kv7-m-yamada", without.BuildingUpChannel);
        // The M-current's threshold stays roughly constant (common practice): well under a millivolt over the train.
        Assert.InRange(with.ThresholdRiseMv!.Value, -1, 1);
    }

    [Fact]
    public void Slowly_inactivating_sodium_raises_the_effective_threshold_after_the_train()
    {
        var nap = WithNaP.Value;
        var without = WithoutM.Value;
        Assert.Equal("nap-prebotc-butera1999", nap.BuildingUpChannel);
        var probe = nap.AfterTrain!;
        // A higher pulse threshold after the train with the membrane no lower than at rest: not a deeper start, a higher threshold.
        Assert.True(probe.CurrentRatio > 1.05, $"pulse threshold ratio after the train {probe.CurrentRatio}");
        Assert.True(probe.MembraneBeforeMv >= probe.RestMv - 0.5, $"membrane {probe.MembraneBeforeMv} mV, rest {probe.RestMv} mV");
        Assert.True(without.AfterTrain!.CurrentRatio < 1.02, $"without: ratio {without.AfterTrain.CurrentRatio}");
        Assert.True(nap.ThresholdRiseMv > without.ThresholdRiseMv, $"threshold rise {nap.ThresholdRiseMv} mV against {without.ThresholdRiseMv} mV");
    }

    [Fact]
    public void A_synthetic_train_gives_its_known_thresholds_troughs_and_intervals()
    {
        // Piecewise-linear spikes at 10 kHz: 1 mV/ms ramps (below the 20 mV/ms criterion) to a threshold, 100 mV/ms up to
        // +30 mV, 100 mV/ms down to a trough, then the ramp again. Thresholds -50, -48, -46 mV; troughs -60, -62, -64 mV.
        double dt = 0.1;
        var v = new List<double>();
        double[] thresholds = [-50, -48, -46], troughs = [-60, -62, -64];
        double x = -55;
        var crossings = new List<double>();
        void Ramp(double to, double slope)
        {
            while (Math.Abs(to - x) > 1e-9)
            {
                double stepMv = Math.Sign(to - x) * Math.Min(Math.Abs(to - x), slope * dt);
                x += stepMv;
                v.Add(x);
            }
        }
        v.Add(x);
        for (int k = 0; k < 3; k++)
        {
            Ramp(thresholds[k], 1);
            int at = v.Count;
            Ramp(30, 100);
            crossings.Add((at + (-20 - thresholds[k]) / 10.0 - 1) * dt);
            Ramp(troughs[k], 100);
            Ramp(troughs[k] + 2, 1);
        }
        var spikes = AdaptationMechanisms.SpikesOfTrain(v.ToArray(), dt, 0, crossings, v.Count * dt);
        Assert.Equal(3, spikes.Count);
        for (int k = 0; k < 3; k++)
        {
            Assert.Equal(thresholds[k], spikes[k].ThresholdMv, 1e-9);
            Assert.Equal(troughs[k], spikes[k].TroughMv, 1e-9);
            Assert.Equal(thresholds[k] - troughs[k], spikes[k].AfterHyperpolarisationMv, 1e-9);
        }
        Assert.Equal(crossings[1] - crossings[0], spikes[0].IntervalMs!.Value, 1e-9);
        Assert.Null(spikes[2].IntervalMs);
        // Least-squares slope of 2 mV per spike (exact for points on a line).
        Assert.Equal(2, AdaptationMechanisms.SlopePerSpike(spikes.Select(s => s.ThresholdMv).ToArray())!.Value, 1e-9);
    }

    [Fact]
    public void Bad_settings_are_refused_naming_the_setting()
    {
        var e = Assert.Throws<ArgumentException>(() => AdaptationMechanisms.Measure(TestCatalog.Preset("hh1952"), 10,
            MechanismSettings.Default with { ProbePulseMs = 0 }));
        Assert.Contains("probePulseMs", e.Message);
    }
}
