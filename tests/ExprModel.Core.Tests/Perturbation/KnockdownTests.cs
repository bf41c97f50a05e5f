using ExprModel.Core.Perturbation;

namespace ExprModel.Core.Tests.Perturbation;

public class KnockdownTests
{
    private static readonly Lazy<KnockdownReport> Removed = new(() =>
    {
        var model = TestCatalog.Preset("cortex-rs2008").Model;
        var probe = new DensityProbe(model, Knockdown.DefaultSettings);
        return Knockdown.Run(model, KnockdownTarget.Channels(probe.ChannelLabels, 0), 0);
    });

    [Fact]
    public void Removing_sodium_takes_the_rheobase_away_and_ranks_it_first()
    {
        // Common practice: without sodium channels there is no action potential (Hodgkin & Huxley 1952).
        var ranked = Removed.Value.Ranked("rheobase");
        // Without the delayed rectifier the cell does not repolarise either; lost read-outs rank before any finite change.
        var lost = ranked.TakeWhile(c => c.Lost).Select(c => c.Target).ToArray();
        Assert.Contains("traub-na", lost);
        Assert.DoesNotContain("leak", lost);
        Assert.Equal(4, ranked.Count);
    }

    [Fact]
    public void Removing_leak_raises_input_resistance_and_removing_m_current_lowers_adaptation()
    {
        // Common practice: less resting conductance, higher input resistance; no M-current, less spike-frequency adaptation.
        var rin = Removed.Value.Ranked("input_resistance").Single(c => c.Target == "leak");
        Assert.True(rin.Change > 0 && rin.RelativeChange > 0.1, $"{rin}");
        var adapt = Removed.Value.Ranked("adaptation_ratio").Single(c => c.Target == "kv7-m-yamada");
        Assert.True(adapt.Change < 0, $"{adapt}");
    }

    [Fact]
    public void A_change_is_the_knocked_down_value_minus_the_intact_one()
    {
        var c = new KnockdownChange("x", KnockdownKind.Channel, "rheobase", "uA/cm2", 2, 3);
        Assert.Equal(1, c.Change);
        Assert.Equal(0.5, c.RelativeChange);
        Assert.False(c.Lost);
        Assert.True(new KnockdownChange("x", KnockdownKind.Channel, "rheobase", "uA/cm2", 2, null).Lost);
        Assert.Throws<ArgumentException>(() => Knockdown.Run(TestCatalog.Preset("wb1996").Model, [], -1));
    }
}
