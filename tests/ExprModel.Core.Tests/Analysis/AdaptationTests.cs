using ExprModel.Core.Analysis;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>Spike-frequency adaptation of the published presets and of spike trains with known intervals.</summary>
public sealed class AdaptationTests
{
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

    [Fact]
    public void Intervals_growing_by_a_fixed_factor_give_its_power_and_the_index_of_one_pair()
    {
        // ISIs 10, 15, 22.5, 33.75 ms (factor k = 1.5): ratio k^3; each pair gives (k - 1) / (k + 1) = 0.2 (identity).
        var (ratio, index) = Adaptation.FromSpikeTimes([100, 110, 125, 147.5, 181.25]);
        Assert.Equal(Math.Pow(1.5, 3), ratio!.Value, 1e-12);
        Assert.Equal(0.2, index!.Value, 1e-12);
        var (twoRatio, twoIndex) = Adaptation.FromSpikeTimes([100, 110]);
        Assert.Null(twoRatio);
        Assert.Null(twoIndex);
    }
}
