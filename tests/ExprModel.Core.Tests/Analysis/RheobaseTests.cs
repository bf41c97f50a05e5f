using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>
/// The rheobase search on model cells: a seeded search gives the cold answer, steps the model cannot follow count as no
/// spike, and cells whose spiking is not monotone in the step amplitude are measured again unseeded.
/// </summary>
public sealed class RheobaseTests
{
    [Fact]
    public void A_seeded_search_that_notices_a_gap_gives_the_cold_answer()
    {
        // Demo cell FH2046 (strong Kv7 M-current): a narrow range of small steps crosses the detection level, larger
        // ones do not, larger ones again. When a seeded search's probes see that, the read-outs are measured again
        // unseeded, so the live table equals the cold measurement a share link stores. (A seeded search that never
        // probes the gap can still land in another window: that is the path dependence the note warns of.)
        var doc = DemoCells.Model("FH2046");
        var cell = new CompiledCell(TestCatalog.Catalog.BuildCell(doc));
        var s = ReadoutSettings.Live;
        var cold = Features.MeasureFirst(cell, s);
        double g = cold.SlopeConductanceMsPerCm2!.Value;
        var (start, max) = Rheobase.SearchRange(g);
        int noticed = 0;
        foreach (double hint in new[] { 0.5, 1, 1.5, 2, 3, 5, 8, 12, 20, 30 })
        {
            var probe = Rheobase.Search(cell, cold.RestState!, start, max, s, default, hint);
            if (probe.Bracket?.NotMonotone is null) continue;
            noticed++;
            var seeded = Features.MeasureFirst(cell, s, default, new RheobaseHint(hint, g));
            Assert.Equal(cold.RheobaseUaPerCm2, seeded.RheobaseUaPerCm2);
            Assert.Equal(cold.ThresholdMv, seeded.ThresholdMv);
            Assert.Contains(seeded.Notes, n => n.StartsWith("Spiking is not monotone", StringComparison.Ordinal));
        }
        Assert.True(noticed > 0, "no hint led the search across the gap");
    }

    [Fact]
    public void Steps_that_drive_the_membrane_out_of_range_count_as_no_spike_and_are_named()
    {
        // Demo cell FH2018: large search steps run its membrane past 1000 mV (there the leak carries the largest
        // current; the voltage-gated channels pass little). Such steps count as no spike, the other read-outs are
        // measured and a note names the step.
        var cell = new CompiledCell(TestCatalog.Catalog.BuildCell(DemoCells.Model("FH2018")));
        var first = Features.MeasureFirst(cell, ReadoutSettings.Live);
        Assert.Null(first.RheobaseUaPerCm2);
        Assert.NotNull(first.RestingPotentialMv);
        Assert.Contains(first.Notes, n => n.Contains("drove the membrane past 1000 mV", StringComparison.Ordinal));
        Assert.Contains(first.Notes, n => n.StartsWith("No spike for steps up to", StringComparison.Ordinal));
        var all = Features.Complete(cell, first, ReadoutSettings.Live);
        Assert.True(all.IsComplete);
    }

    [Theory]
    [InlineData("wb1996")]
    [InlineData("cortex-rs2008")]
    public void Rheobase_of_a_published_model_does_not_depend_on_the_hint(string preset)
    {
        var cell = TestCatalog.Preset(preset);
        var cold = Features.MeasureFirst(cell, ReadoutSettings.Live);
        Assert.NotNull(cold.RheobaseUaPerCm2);
        foreach (double factor in new[] { 0.6, 0.98, 1.05, 1.7, 40 })
        {
            // A hint from a "similar cell" whose rheobase and slope conductance are off by the factor and its square root.
            var hint = new RheobaseHint(cold.RheobaseUaPerCm2!.Value * factor, cold.SlopeConductanceMsPerCm2!.Value * Math.Sqrt(factor));
            var seeded = Features.MeasureFirst(cell, ReadoutSettings.Live, default, hint);
            Assert.Equal(cold.RheobaseUaPerCm2, seeded.RheobaseUaPerCm2);
            Assert.Equal(cold.ThresholdMv, seeded.ThresholdMv);
            Assert.Equal(cold.InputResistanceMOhm, seeded.InputResistanceMOhm);
        }
        // The two stages together are the one-call read-outs.
        var all = Features.Measure(cell, ReadoutSettings.Live);
        var staged = Features.Complete(cell, cold, ReadoutSettings.Live);
        Assert.Equal(all.Rows(), staged.Rows());
        Assert.False(cold.IsComplete);
        Assert.True(staged.IsComplete);
    }
}
