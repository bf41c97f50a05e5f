using ExprModel.Core.Analysis;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>Excitability class and adaptation of the published presets.</summary>
public class PublishedModelClassTests
{
    [Fact]
    public void WangBuzsakiInterneuronIsClassOne()
    {
        // Wang & Buzsaki 1996 (J Neurosci 16:6402): the model fires at arbitrarily low rates near onset (class 1).
        var r = Features.Measure(TestCatalog.Preset("wb1996"));
        Assert.Equal(1, r.ExcitabilityClass);
        Assert.True(r.OnsetRateHz < 5, $"onset rate {r.OnsetRateHz} Hz");
        // The same paper places rest near -64/-65 mV with E_L = -65 mV (from memory).
        Assert.InRange(r.RestingPotentialMv!.Value, -66, -63);
    }

    [Fact]
    public void RegularSpikingPresetAdaptsAndFastSpikingDoesNot()
    {
        // Pospischil et al. 2008 (Biol Cybern 99:427): the regular-spiking model shows spike-frequency adaptation
        // through its M-current, the fast-spiking model fires with little adaptation.
        var rs = Features.Measure(TestCatalog.Preset("cortex-rs2008"));
        var fs = Features.Measure(TestCatalog.Preset("cortex-fs2008"));
        Assert.True(rs.AdaptationRatio > 1.5, $"RS adaptation ratio {rs.AdaptationRatio}");
        Assert.True(fs.AdaptationRatio < 1.1, $"FS adaptation ratio {fs.AdaptationRatio}");
        Assert.True(rs.AdaptationIndex > fs.AdaptationIndex);
    }
}
