using ExprModel.Core.Analysis;
using ExprModel.Core.Mapping;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Mapping;

/// <summary>
/// The invented demo survey end to end: table, metadata, mapping, density rule, models, read-outs. The scenario
/// was designed (catalog/demo/README.md) so its five groups fire differently; these tests hold it to that design.
/// </summary>
public class DemoGroupsTests
{
    private static readonly Lazy<IReadOnlyDictionary<string, (CompiledCell Cell, CellReadouts Readouts)>> Groups = new(() =>
    {
        var data = DemoCells.WithGroups();
        var report = data.Map();
        return data.Groups!.Members.Keys.ToDictionary(g => g, g =>
        {
            var built = data.Build(report, new DensityRule(), ModelTarget.ForGroup(g));
            var cell = new CompiledCell(TestCatalog.Catalog.BuildCell(built.Document));
            return (cell, Features.Measure(cell, ReadoutSettings.Batch));
        });
    });

    [Fact]
    public void TheFiveGroupsFireDifferently()
    {
        var r = Groups.Value.ToDictionary(p => p.Key, p => p.Value.Readouts);
        Assert.Equal(5, r.Count);
        Assert.True(r["T5-pacing"].FiresAtRest);
        Assert.All(r.Where(p => p.Key != "T5-pacing"), p => Assert.False(p.Value.FiresAtRest, p.Key));
        var quiet = r.Where(p => p.Key != "T5-pacing").ToDictionary(p => p.Key, p => p.Value);
        Assert.Equal("T4-low-threshold", quiet.MinBy(p => p.Value.RheobaseUaPerCm2!.Value).Key);
        Assert.Equal("T2-adapting", quiet.MaxBy(p => p.Value.AdaptationIndex ?? double.MinValue).Key);
        Assert.True(quiet["T3-bursting"].AdaptationRatio < 1, "bursting-prone group: intervals shorten within the train");
        Assert.True(quiet["T1-fast"].HalfWidthMs < quiet["T2-adapting"].HalfWidthMs, "fast group: narrower spikes");
    }

    [Fact]
    public void SimdSweepMatchesScalarLoopOnEveryDemoModel()
    {
        foreach (var (group, (cell, readouts)) in Groups.Value)
        {
            double top = 3 * (readouts.RheobaseUaPerCm2 ?? 1);
            var amps = Enumerable.Range(0, 4).Select(i => top * i / 3).ToArray();
            Simulation.SimdAgreement.Check(cell, amps, 500, group);
        }
    }

    [Fact]
    public void Every_cells_input_resistance_is_positive_or_undefined_with_a_reason()
    {
        // A passive response moves V with the current, so an input resistance is positive by definition (common
        // practice); where a cell's small step does not give one, the read-out must be missing and say why.
        var data = DemoCells.WithGroups();
        var report = data.Map();
        var rows = BatchReadouts.Run(data.Table, report, data.Catalog, new DensityRule(), data.CellTargets, data.Groups, 0, data.CellTargets.Count);
        Assert.Equal(240, rows.Count);
        foreach (var row in rows.Where(r => r.Readouts is { FiresAtRest: false }))
        {
            var r = row.Readouts!;
            if (r.InputResistanceMOhm is { } rin) Assert.True(rin > 0, $"{row.Item}: input resistance {rin} MOhm");
            else Assert.Contains(r.Notes, n => n.Contains("input resistance and time constant are not defined", StringComparison.Ordinal));
            if (r.MembraneTimeConstantMs is { } tau) Assert.True(tau > 0, $"{row.Item}: time constant {tau} ms");
        }
    }
}
