using ExprModel.Core.Export;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Map page's every-cell batch: a model per cell of a grouped dataset with the workspace's mapping and rule,
/// measured with the batch read-outs in bounded chunks (progress, cancel), summarised by group and written as CSV.
/// Each cell's expression is taken as read or shrunk towards its group (<see cref="Shrinkage"/>; shrunk by default when
/// recorded values are loaded, as the library's compare does, since a single cell's zero count is often a dropout).
/// </summary>
public sealed class CellBatchJob(WorkspaceState workspace, ModelRunner runner, Func<Task> changed) : IDisposable
{
    /// <summary>The group column's value for cells without a label.</summary>
    public const string NoLabel = "(no label)";

    private CancellationTokenSource? _cts;
    private Dictionary<string, string>? _groupByCell;
    private List<BatchRow>? _rows;
    private PerCellShrinkage? _shrink;
    private MappingReport? _report;

    public bool Busy { get; private set; }
    public bool Cancelled { get; private set; }
    public int Done { get; private set; }
    public int Total { get; private set; }
    /// <summary>Rows measured so far (a cancelled job keeps what it has); null before the first run.</summary>
    public IReadOnlyList<BatchRow>? Rows => _rows;

    /// <summary>How the next run estimates each cell's expression.</summary>
    public ShrinkageMode Shrinkage { get; set; } = workspace.Recorded.HasValues ? ShrinkageMode.Group : ShrinkageMode.None;
    /// <summary>How the rows shown were estimated (null before a run), and the library's note on it.</summary>
    public ShrinkageMode? UsedShrinkage { get; private set; }
    public string ExpressionNote { get; private set; } = "";

    /// <summary>The group of a cell id in the workspace's dataset; null for an unlabelled cell or an ungrouped dataset.</summary>
    public string? GroupOf(string cellId)
    {
        if (workspace.Session?.Dataset is not { Groups: { } groups } dataset) return null;
        _groupByCell ??= groups.Members.SelectMany(m => m.Value.Select(i => (Cell: dataset.Table.CellIds[i], Group: m.Key)))
            .ToDictionary(x => x.Cell, x => x.Group, StringComparer.Ordinal);
        return _groupByCell.TryGetValue(cellId, out var g) ? g : null;
    }

    /// <summary>The rows so far summarised by group (unlabelled cells under <see cref="NoLabel"/>).</summary>
    public IReadOnlyList<BatchGroupSummary> Summary() => _rows is null ? [] : BatchGroupSummary.Create(_rows, id => GroupOf(id) ?? NoLabel);

    /// <summary>Batch read-outs for every cell, in bounded chunks with progress; cancellable. The rule is the one the models were built with.</summary>
    /// <param name="failed">Gets a message for the user.</param>
    public async Task RunAsync(MappingReport report, Action<string?> failed)
    {
        if (workspace.Session is not { } session) return;
        _cts?.Cancel();
        _cts?.Dispose();
        _cts = new CancellationTokenSource();
        var token = _cts.Token;
        Busy = true; Cancelled = false; Done = 0; Total = session.Dataset.Table.CellIds.Count;
        var rows = _rows = [];
        var mode = Shrinkage;
        failed(null);
        try
        {
            _shrink = mode == ShrinkageMode.Group ? await Task.Run(() => session.Dataset.Shrink(report), token) : null;
            _report = report;
            UsedShrinkage = mode;
            ExpressionNote = _shrink?.Note ?? "per-cell expression as read (not shrunk).";
            await runner.CellBatchAsync(session.Dataset, report, workspace.Rule, done => { Done = done; _ = changed(); }, token,
                chunk => rows.AddRange(chunk), _shrink);
        }
        catch (OperationCanceledException) { Cancelled = true; }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException) { failed(e.Message); }
        finally { Busy = false; }
        await changed();
    }

    public void Cancel()
    {
        _cts?.Cancel();
        Cancelled = true;
        _ = changed();
    }

    /// <exception cref="UserInputException">The model cannot be built (the library's reason).</exception>
    /// <summary>
    /// Builds <paramref name="cellId"/>'s model as the rows shown were built (same rule and expression estimate) and opens
    /// it on the Workbench.
    /// </summary>
    public void OpenCell(string cellId)
    {
        if (workspace.Session is not { } session || _report is null) return;
        var target = ModelTarget.ForCell(cellId);
        BuiltModel built;
        try
        {
            built = _shrink is not null ? _shrink.Build(session.Dataset.Catalog, workspace.Rule, target, session.Dataset.Groups)
                : session.Build(_report, workspace.Rule, target);
        }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
        string how = UsedShrinkage == ShrinkageMode.Group ? "expression shrunk towards its group" : "expression as read";
        workspace.Open(built.Document, $"built from cell {cellId} ({how})", null, target);
    }

    /// <summary>
    /// One row per cell with its group (as `exprmodel batch --per cell`), the caution, the rule and the expression estimate
    /// in the comments; null before a run.
    /// </summary>
    public string? Csv()
    {
        if (_rows is null || workspace.Session is not { } session) return null;
        var rule = workspace.Rule;
        return BatchTable.Create(_rows, [ResearchCaution.Text,
            $"source: {session.Dataset.Table.Source}; every cell ({_rows.Count} of {Total}); rule: exponent {rule.Exponent}, reference "
                + $"{rule.ReferenceGroup ?? "dataset median"}, clamp {rule.ClampToPlausibleRange}",
            ExpressionNote], GroupOf).ToString();
    }

    public void Dispose()
    {
        _cts?.Cancel();
        _cts?.Dispose();
    }
}
