using ExprModel.Core.Analysis;
using ExprModel.Core.Expression;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Mapping;

/// <summary>
/// Builds and measures a model for every group or cell: the same builder and feature extractor as everywhere, with
/// the batch read-out settings, in parallel over the machine's cores. Used by the CLI, the web app and the benchmark.
/// </summary>
public static class BatchReadouts
{
    /// <summary>Standard absolute steps (pA) at which rates are reported.</summary>
    public static readonly double[] StandardStepsPa = [100, 200, 400];

    public static IReadOnlyList<BatchRow> Run(ExpressionTable table, MappingReport report, MappingCatalog catalog, DensityRule rule,
        IReadOnlyList<ModelTarget> targets, CellGroups? groups, int from, int to, Action<int>? progress = null, CancellationToken cancel = default,
        PerCellShrinkage? shrinkage = null)
    {
        var rows = new BatchRow[to - from];
        int done = 0;
        // Cells keep every core busy: each cell's sweeps and side runs stay on its own thread.
        Simulator.ForEachItem(to - from, cancel, k =>
        {
            int i = from + k;
            var t = targets[i];
            string item = t.Group ?? t.CellId!;
            int cells = t.Group is { } g && groups is not null && groups.Members.TryGetValue(g, out var m) ? m.Length : 1;
            try
            {
                var built = shrinkage?.Build(catalog, rule, t, groups) ?? ExpressionModelBuilder.Build(table, report, catalog, rule, t, groups);
                var cell = new CompiledCell(built.Document.ToCellModel((id, _) => catalog.Entry(id)!));
                var geo = cell.Model.Geometry;
                var settings = ReadoutSettings.Batch with { ExtraStepsUaPerCm2 = StandardStepsPa.Select(geo.PicoampsToDensity).ToArray() };
                var r = Features.Measure(cell, settings, cancel);
                // Cells that fire at rest or never fire skip the f-I sweep; measure the standard steps on their own then.
                var rates = r.ExtraSteps.Count == StandardStepsPa.Length ? r.ExtraSteps
                    : FiCurve.Measure(cell, settings.ExtraStepsUaPerCm2, 1000, null, null, cancel);
                rows[i - from] =
                    new BatchRow(i, item, cells, r, rates.Select(q => q.WholeStepRateHz).ToArray(), string.Join(" | ", built.Warnings.Concat(r.Notes)));
            }
            catch (Exception e) when (e is ArgumentException or ModelException or SimulationBlowUpException)
            {
                rows[i - from] = new BatchRow(i, item, cells, null, [], "failed: " + e.Message);
            }
            progress?.Invoke(Interlocked.Increment(ref done));
        });
        return rows;
    }
}
