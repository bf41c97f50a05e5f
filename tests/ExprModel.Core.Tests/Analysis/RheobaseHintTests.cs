using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>The rheobase hint: scaled by slope conductance, and withheld for a cell whose spiking is not monotone.</summary>
public sealed class RheobaseHintTests
{
    [Fact]
    public void A_cell_whose_spiking_is_not_monotone_gives_no_hint()
    {
        // Demo cell FH2046 (a gap in spiking, see RheobaseTests): its cold search reports the gap, so the search of the
        // next density change must start from scratch; a published model's cell has no gap and gives its rheobase and
        // slope conductance as the hint.
        var doc = DemoCells.Model("FH2046");
        var gapped = Features.MeasureFirst(new CompiledCell(TestCatalog.Catalog.BuildCell(doc)), ReadoutSettings.Live);
        Assert.True(gapped.SpikingNotMonotone);
        Assert.NotNull(gapped.RheobaseUaPerCm2);
        Assert.Null(gapped.Hint);
        var plain = Features.MeasureFirst(TestCatalog.Preset("wb1996"), ReadoutSettings.Live);
        Assert.False(plain.SpikingNotMonotone);
        Assert.Equal(new RheobaseHint(plain.RheobaseUaPerCm2!.Value, plain.SlopeConductanceMsPerCm2!.Value), plain.Hint);
        // The second stage keeps the flag (repeated read-outs take their hint from the complete set).
        Assert.True(Features.Complete(new CompiledCell(TestCatalog.Catalog.BuildCell(doc)), gapped, ReadoutSettings.Live).SpikingNotMonotone);
    }

    [Fact]
    public void A_hint_predicts_rheobase_in_proportion_to_slope_conductance()
    {
        var hint = new RheobaseHint(2.0, 0.1);
        Assert.Equal(3.0, hint.PredictFor(0.15), 12);
        Assert.Equal(2.0, hint.PredictFor(0.1), 12);
        Assert.Equal(2.0, new RheobaseHint(2.0, 0).PredictFor(0.15)); // no usable ratio: the rheobase itself
        Assert.Equal(2.0, hint.PredictFor(-0.1));
    }
}
