using ExprModel.Core.Export;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Map page's every-cell batch: a model per cell of a grouped dataset with the workspace's mapping and rule,
/// measured with the batch read-outs in bounded chunks (progress, cancel), summarised by group and written as CSV.
/// </summary>
public sealed class CellBatchJob(WorkspaceState workspace, ModelRunner runner, Func<Task> changed) : IDisposable
{
    /// <summary>The group column's value for cells without a label.</summary>
    public const string NoLabel = "(no label)";

    private CancellationTokenSource? _cts;
    private Dictionary<string, string>? _groupByCell;
    private List<BatchRow>? _rows;

    public bool Busy { get; private set; }
    public bool Cancelled { get; private set; }
    public int Done { get; private set; }
    public int Total { get; private set; }
    /// <summary>Rows measured so far (a cancelled job keeps what it has); null before the first run.</summary>
    public IReadOnlyList<BatchRow>? Rows => _rows;

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
        failed(null);
        try
        {
            await runner.CellBatchAsync(session.Dataset, report, workspace.Rule, done => { Done = done; _ = changed(); }, token, chunk => rows.AddRange(chunk));
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

    /// <summary>One row per cell with its group (as `exprmodel batch --per cell`), the caution and the rule in the comments; null before a run.</summary>
    public string? Csv()
    {
        if (_rows is null || workspace.Session is not { } session) return null;
        var rule = workspace.Rule;
        return BatchTable.Create(_rows, [ResearchCaution.Text,
            $"source: {session.Dataset.Table.Source}; every cell ({_rows.Count} of {Total}); rule: exponent {rule.Exponent}, reference {rule.ReferenceGroup ?? "dataset median"}, clamp {rule.ClampToPlausibleRange}"], GroupOf).ToString();
    }

    public void Dispose()
    {
        _cts?.Cancel();
        _cts?.Dispose();
    }
}
