using ExprModel.Core.Confrontation;
using ExprModel.Core.Export;
using ExprModel.Core.Models;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The every-cell view's confrontation: the per-cell read-outs of <see cref="CellBatchJob"/> held against the recorded
/// values of the workspace's <see cref="RecordedData"/> by the library's <see cref="PredictedVersusRecorded.Compare"/>
/// (differences, z-scores against each group's recorded SD, Pearson and Spearman r, mean absolute error, bias), shaped
/// for scatter plots and tables, and exported with <see cref="ConfrontationTable"/>. Recomputed when the rows or the
/// recorded data change.
/// </summary>
public sealed class ConfrontationView(WorkspaceState workspace, CellBatchJob job)
{
    /// <summary>One point of a scatter: a cell's predicted and recorded value.</summary>
    public sealed record Point(string CellId, double Predicted, double Recorded);

    private ConfrontationResult? _result;
    private (IReadOnlyList<ExprModel.Core.Mapping.BatchRow>? Rows, int Count, int Version) _key;

    /// <summary>The read-out whose per-cell table is shown.</summary>
    public string? Selected { get; set; }

    /// <summary>The comparison of the rows measured so far, or null when there is nothing to compare.</summary>
    public ConfrontationResult? Result
    {
        get
        {
            if (job.Rows is not { Count: > 0 } rows || workspace.Recorded.Compared is not { Readouts.Count: > 0 } features) return null;
            var key = (job.Rows, rows.Count, workspace.Recorded.Version);
            if (_result is not null && _key == key) return _result;
            var predictions = rows.ToDictionary(r => r.Item, r => new CellPrediction(r.Item, r.Readouts, r.Warnings), StringComparer.Ordinal);
            // Cells not measured yet (a cancelled run) are left out rather than reported as not predicted.
            var measured = new RecordedFeatures
            {
                Source = features.Source,
                Matches = features.Matches,
                Readouts = features.Readouts,
                Notes = features.Notes,
                RecordedCells = features.RecordedCells.Where(predictions.ContainsKey).ToArray(),
            };
            _result = PredictedVersusRecorded.Compare(measured, predictions, job.GroupOf, ModelPer.Cell, job.ExpressionNote);
            _key = key;
            Selected ??= _result.Agreement.FirstOrDefault(a => a.Cells > 0)?.Readout;
            return _result;
        }
    }

    /// <summary>Scatter points of one read-out by group (cells with both values), groups in name order.</summary>
    public IReadOnlyList<(string Group, IReadOnlyList<Point> Points)> Scatter(string readout) => Result is not { } r ? [] :
        r.Cells.Where(c => c.Readout == readout && c.Predicted is not null && c.Recorded is not null)
            .GroupBy(c => c.Group ?? CellBatchJob.NoLabel, StringComparer.Ordinal).OrderBy(g => g.Key, StringComparer.Ordinal)
            .Select(g => (g.Key, (IReadOnlyList<Point>)g.Select(c => new Point(c.CellId, c.Predicted!.Value, c.Recorded!.Value)).ToArray())).ToArray();

    /// <summary>The per-cell rows of the selected read-out.</summary>
    public IReadOnlyList<CellComparison> SelectedCells() => Result is not { } r || Selected is null ? [] : r.Cells.Where(c => c.Readout == Selected).ToArray();

    /// <summary>The library's comparison table (caution, expression estimate and column matches in the comments); null without a result.</summary>
    public string? Csv()
    {
        if (Result is not { } r || workspace.Session is not { } session) return null;
        return ConfrontationTable.Create(r, ConfrontationTable.Comments(r, ResearchCaution.Text, session.Dataset.Table.Source)).ToString();
    }
}
