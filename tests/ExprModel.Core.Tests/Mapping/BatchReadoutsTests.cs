using ExprModel.Core.Analysis;
using ExprModel.Core.Mapping;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Mapping;

/// <summary>
/// The batch keeps each cell's sweeps on the cell's own thread (<see cref="Simulator.SpreadOverCores"/>): its rows must
/// equal the read-outs of the same models measured one at a time with the sweeps spread over the cores, and the caller's
/// own setting must be left as it was.
/// </summary>
public sealed class BatchReadoutsTests
{
    [Fact]
    public void RowsEqualTheSameModelsMeasuredOneAtATimeAndTheCallersSettingIsKept()
    {
        var data = DemoCells.WithGroups();
        var report = data.Map();
        var targets = data.CellTargets.Take(3).ToArray();
        var rows = BatchReadouts.Run(data.Table, report, data.Catalog, new DensityRule(), targets, data.Groups, 0, targets.Length);
        Assert.True(Simulator.SpreadOverCores);
        for (int i = 0; i < targets.Length; i++)
        {
            var built = data.Build(report, new DensityRule(), targets[i]);
            var cell = new CompiledCell(TestCatalog.Catalog.BuildCell(built.Document));
            var settings = ReadoutSettings.Batch with
            {
                ExtraStepsUaPerCm2 = BatchReadouts.StandardStepsPa.Select(cell.Model.Geometry.PicoampsToDensity).ToArray(),
            };
            var alone = Features.Measure(cell, settings);
            var row = rows[i].Readouts ?? throw new Xunit.Sdk.XunitException($"row {i} failed: {rows[i].Warnings}");
            Assert.Equal(alone.Rows().Select(r => r.Value), row.Rows().Select(r => r.Value));
            Assert.Equal(alone.FiCurve.SelectMany(p => p.SpikeTimesMs), row.FiCurve.SelectMany(p => p.SpikeTimesMs));
        }
    }
}
