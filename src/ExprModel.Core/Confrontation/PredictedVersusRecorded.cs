using ExprModel.Core.Mapping;

namespace ExprModel.Core.Confrontation;

/// <summary>
/// Holds every prediction against what was recorded from the same cells: builds and measures the models (per cell, with
/// <see cref="PerCellShrinkage"/> unless turned off, or per group) with <see cref="BatchReadouts"/>, then compares each
/// matched read-out per cell, per group and across cells. Used by the command line's compare command and the HTTP API.
/// </summary>
public static class PredictedVersusRecorded
{
    /// <summary>Builds the models the recorded cells need, measures them and compares.</summary>
    /// <param name="shrinkage">How a per-cell model estimates its cell's expression (ignored for group models).</param>
    /// <param name="progress">Called with the number of models measured so far.</param>
    public static ConfrontationResult Run(ExpressionDataset data, MappingReport report, DensityRule rule, RecordedFeatures recorded, ModelPer per,
        ShrinkageMode shrinkage, Action<int, int>? progress = null, CancellationToken cancel = default)
    {
        var groupOf = GroupOf(data);
        var predictions = new Dictionary<string, CellPrediction>(StringComparer.Ordinal);
        string note = "";
        if (per == ModelPer.Cell)
        {
            var targets = recorded.RecordedCells.Select(ModelTarget.ForCell).ToArray();
            PerCellShrinkage? shrink = shrinkage == ShrinkageMode.Group ? data.Shrink(report) : null;
            note = shrink?.Note ?? "per-cell expression as read (not shrunk).";
            var rows = BatchReadouts.Run(data.Table, report, data.Catalog, rule, targets, data.Groups, 0, targets.Length,
                n => progress?.Invoke(n, targets.Length), cancel, shrink);
            foreach (var r in rows) predictions[r.Item] = new CellPrediction(r.Item, r.Readouts, r.Warnings);
        }
        else
        {
            if (data.Groups is null) throw new ArgumentException("Group models need a metadata table and a group column.");
            var groups = recorded.RecordedCells.Select(c => groupOf.GetValueOrDefault(c)).OfType<string>().Distinct(StringComparer.Ordinal)
                .Order(StringComparer.Ordinal).ToArray();
            var targets = groups.Select(ModelTarget.ForGroup).ToArray();
            var rows = BatchReadouts.Run(data.Table, report, data.Catalog, rule, targets, data.Groups, 0, targets.Length,
                n => progress?.Invoke(n, targets.Length), cancel);
            var byGroup = rows.ToDictionary(r => r.Item, StringComparer.Ordinal);
            foreach (var cell in recorded.RecordedCells)
                predictions[cell] = groupOf.TryGetValue(cell, out var g)
                    ? new CellPrediction("group " + g, byGroup[g].Readouts, byGroup[g].Warnings)
                    : new CellPrediction("-", null, $"cell {cell} has no '{data.Groups.Column}' label, so no group model.");
        }
        return Compare(recorded, predictions, c => groupOf.GetValueOrDefault(c), per, note);
    }

    /// <summary>Compares predictions with recorded values.</summary>
    /// <param name="predictions">The prediction for each recorded cell (a cell missing here is reported as not predicted).</param>
    /// <param name="groupOf">Each cell's group, or null.</param>
    public static ConfrontationResult Compare(RecordedFeatures recorded, IReadOnlyDictionary<string, CellPrediction> predictions, Func<string, string?> groupOf,
        ModelPer per, string expressionNote = "")
    {
        var cells = new List<CellComparison>();
        var groups = new List<GroupComparison>();
        var agreement = new List<ReadoutAgreement>();
        foreach (var r in recorded.Readouts)
        {
            string unit = r.ReadoutUnit.Symbol;
            var rows = new List<CellComparison>();
            foreach (var cell in recorded.RecordedCells)
            {
                if (!r.ValueByCell.TryGetValue(cell, out double raw)) continue;
                var p = predictions.GetValueOrDefault(cell);
                double? area = p?.Readouts?.AreaUm2 is > 0 and var a ? a : null;
                double? rec = r.ColumnUnit.Quantity == r.ReadoutUnit.Quantity || area is not null ? r.InReadoutUnit(raw, area) : null;
                double? pred = p?.Readouts?.Rows().First(x => x.Name == r.Readout).Value is { } v && double.IsFinite(v) ? v : null;
                string why = p is null ? "not predicted."
                    : p.Readouts is null ? p.Warnings
                    : pred is null ? $"the model gives no {r.Readout}" + (p.Warnings.Length > 0 ? $" ({p.Warnings})" : ".")
                    : "";
                if (rec is null) why = $"recorded {r.ColumnUnit.Symbol} needs the model's area to convert; " + why;
                string source = r.SourceByCell?.GetValueOrDefault(cell) ?? "";
                // With several sources every row names its own; the table-only output stays as it was.
                if (source.Length > 0)
                    why = string.Join(" ", new[] { $"recorded: {source}.", r.NoteByCell?.GetValueOrDefault(cell) ?? "", why }.Where(x => x.Length > 0));
                rows.Add(new CellComparison(cell, groupOf(cell), p?.Model ?? "-", r.Readout, unit, pred, rec, pred - rec, null, why)
                { RecordedSource = source });
            }
            foreach (var g in rows.GroupBy(c => c.Group ?? "", StringComparer.Ordinal).OrderBy(g => g.Key, StringComparer.Ordinal))
            {
                var rec = g.Where(c => c.Recorded is not null).Select(c => c.Recorded!.Value).ToArray();
                var both = g.Where(c => c.Predicted is not null && c.Recorded is not null).ToArray();
                double? sd = AgreementStatistics.SpreadOf(rec);
                double? recMean = rec.Length > 0 ? rec.Average() : null;
                double? predMean = both.Length > 0 ? both.Average(c => c.Predicted!.Value) : null;
                double? diff = both.Length > 0 ? both.Average(c => c.Predicted!.Value) - both.Average(c => c.Recorded!.Value) : null;
                string note = sd is null ? $"z-score undefined: {rec.Length} recorded cell(s), fewer than {AgreementStatistics.MinimumCells}."
                    : sd == 0 ? "z-score undefined: no recorded spread."
                    : "";
                double? scale = sd is > 0 ? sd : null;
                if (g.Key.Length > 0)
                    groups.Add(new GroupComparison(g.Key, r.Readout, unit, rec.Length, recMean, sd, both.Length, predMean, diff, diff / scale, note));
                foreach (var c in g)
                    cells.Add(c with
                    {
                        ZScore = c.Difference / scale,
                        Note = string.Join(" ", new[] { c.Note, c.Difference is not null && scale is null ? note : "" }.Where(s => s.Length > 0)),
                    });
            }
            var paired = rows.Where(c => c.Predicted is not null && c.Recorded is not null).ToArray();
            agreement.Add(AgreementStatistics.Of(r.Readout, unit, paired.Select(c => c.Predicted!.Value).ToArray(),
                paired.Select(c => c.Recorded!.Value).ToArray()));
        }
        return new ConfrontationResult
        {
            Recorded = recorded,
            Per = per,
            ExpressionNote = expressionNote,
            Cells = cells,
            Groups = groups,
            Agreement = agreement
        };
    }

    private static Dictionary<string, string> GroupOf(ExpressionDataset data)
    {
        var map = new Dictionary<string, string>(StringComparer.Ordinal);
        if (data.Groups is null) return map;
        foreach (var (group, members) in data.Groups.Members)
            foreach (int i in members) map[data.Table.CellIds[i]] = group;
        return map;
    }
}
