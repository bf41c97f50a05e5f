using ExprModel.Core.Analysis;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>The hint rule followed over measured models: published ones and demo cell FH2046, whose spiking has a gap.</summary>
public class RheobaseHintTrailTests
{
    private static CellReadouts First(ExprModel.Core.Models.ModelDocument doc) =>
        Features.MeasureFirst(new CompiledCell(doc.ToCellModel(TestCatalog.Catalog.Resolve)), ReadoutSettings.Live);

    [Fact]
    public void Keeps_the_newest_hint_through_a_silent_model_and_drops_it_after_a_gap_in_spiking()
    {
        var trail = new RheobaseHintTrail();
        Assert.Null(trail.Current);

        var wb = TestCatalog.Catalog.Preset("wb1996");
        var measured = First(wb);
        trail.Observe(measured);
        Assert.Equal(measured.Hint, trail.Current);
        Assert.Equal(measured.RheobaseUaPerCm2, trail.Current!.RheobaseUaPerCm2);

        // Sodium off (Wang and Buzsaki 1996 without its spike current): no rheobase, so no hint of its own; the last one stays.
        var silent = First(wb with { Channels = wb.Channels.Select(c => c.Entry == "wb-na-1996" ? c with { RelativeDensity = 0 } : c).ToArray() });
        Assert.Null(silent.RheobaseUaPerCm2);
        trail.Observe(silent);
        Assert.Equal(measured.Hint, trail.Current);

        var dir = CatalogLocator.FindSourceDirectory()!;
        var data = ExpressionDataset.Read(TestCatalog.Catalog.ForMapping(), Path.Combine(dir, "demo", "counts.csv"), new ExpressionReadOptions());
        var gap = First(data.Build(data.Map(), new DensityRule(), ModelTarget.ForCell("FH2046")).Document);
        Assert.True(gap.SpikingNotMonotone, "demo cell FH2046 no longer shows a gap in its spiking");
        trail.Observe(gap);
        Assert.Null(trail.Current);

        trail.Observe(measured);
        trail.Forget();
        Assert.Null(trail.Current);
    }
}
