using System.Globalization;
using ExprModel.Core.Mapping;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Map page without its page: the mapping report with the user's overrides (exclude, re-point, re-weight), the
/// density rule being edited, the models built from it and their read-outs. <paramref name="changed"/> is called
/// whenever something shown changed.
/// </summary>
public sealed class MapSession : IDisposable
{
    private readonly WorkspaceState _workspace;
    private readonly ModelRunner _runner;
    private readonly Func<Task> _changed;
    private CancellationTokenSource? _batchCts;

    public MapSession(WorkspaceState workspace, ModelRunner runner, Func<Task> changed)
    {
        _workspace = workspace;
        _runner = runner;
        _changed = changed;
        Expression = workspace.Session;
        var r = workspace.Rule;
        ReferenceGroup = r.ReferenceGroup ?? "";
        Exponent = r.Exponent; Clamp = r.ClampToPlausibleRange; CapacitancePf = r.CapacitancePf; TemperatureC = r.TemperatureC;
        CellBatch = new CellBatchJob(workspace, runner, changed);
        Confrontation = new ConfrontationView(workspace, CellBatch);
        Remap();
    }

    /// <summary>The table as read (null until the Load page reads one).</summary>
    public ExpressionSession? Expression { get; }
    public MappingReport? Report { get; private set; }
    public string? Error { get; set; }
    public bool Building { get; private set; }

    /// <summary>The density rule's fields as the form edits them ("" = the dataset median as reference).</summary>
    public string ReferenceGroup { get; set; }
    public double Exponent { get; set; }
    public bool Clamp { get; set; }
    public double CapacitancePf { get; set; }
    public double TemperatureC { get; set; }

    /// <summary>Read-outs of every built model, by label, and the job that measures them.</summary>
    public IReadOnlyDictionary<string, ReadoutSet> BatchRows => _batchRows;
    private readonly Dictionary<string, ReadoutSet> _batchRows = new(StringComparer.Ordinal);
    public bool BatchBusy { get; private set; }
    public bool BatchCancelled { get; private set; }
    public int BatchDone { get; private set; }
    public int BatchTotal { get; private set; }

    public CellBatchJob CellBatch { get; }
    /// <summary>The every-cell read-outs against the recorded values, when some are loaded.</summary>
    public ConfrontationView Confrontation { get; }
    public bool HasRecorded => _workspace.Recorded.Compared is { Readouts.Count: > 0 };

    /// <summary>Shows <paramref name="message"/> to the user (a download that failed, say).</summary>
    public void Refuse(string message)
    {
        Error = message;
        _ = _changed();
    }

    public IReadOnlyList<string> GroupNames => Expression?.Dataset.Groups?.Members.Keys.ToArray() ?? [];

    private void Remap()
    {
        if (Expression is null) return;
        try { Report = Expression.Map(_workspace.Overrides); Error = null; }
        catch (Exception e) when (e is ArgumentException or InvalidOperationException) { Error = e.Message; }
    }

    /// <summary>Mean normalised expression of <paramref name="gene"/> over the group's cells (the library's group statistic).</summary>
    public double GroupMean(GeneMapping gene, string group) =>
        CellGroups.Statistic(group, Expression!.Dataset.Groups!.Members[group], gene.ExpressionByCell).Mean;

    public void SetExclude(string gene, bool exclude) => Change(exclude ? new GeneOverride(gene, Exclude: true) : null, gene);

    public void Repoint(string gene, string? entry) => Change(string.IsNullOrEmpty(entry) ? null : new GeneOverride(gene, EntryId: entry), gene);

    public void SetWeight(string gene, string? text)
    {
        if (string.IsNullOrWhiteSpace(text)) { Change(null, gene); return; }
        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var w) || !(w >= 0) || !double.IsFinite(w))
        {
            Error = $"{gene}: the weight must be a number of 0 or more (got '{text}').";
            _ = _changed();
            return;
        }
        Change(new GeneOverride(gene, Weight: w), gene);
    }

    /// <summary>The weight the user gave <paramref name="gene"/> (without re-pointing it), as typed; "" when none.</summary>
    public string WeightOverride(string gene) =>
        _workspace.Overrides.FirstOrDefault(o => o.Gene == gene && o.Weight is not null && o.EntryId is null) is { Weight: { } w }
            ? w.ToString(CultureInfo.InvariantCulture) : "";

    public static string Describe(GeneOverride o) =>
        o.Exclude ? $"{o.Gene} excluded" : o.EntryId is not null ? $"{o.Gene} → {o.EntryId}" : $"{o.Gene} weight {o.Weight}";

    /// <summary>
    /// Replaces the override of <paramref name="gene"/> (none when <paramref name="next"/> is null); built models no longer
    /// match and are dropped.
    /// </summary>
    private void Change(GeneOverride? next, string gene)
    {
        var old = _workspace.Overrides.FirstOrDefault(o => string.Equals(o.Gene, gene, StringComparison.OrdinalIgnoreCase));
        if (old is not null) _workspace.Overrides.Remove(old);
        if (next is not null) _workspace.Overrides.Add(next);
        ForgetBuilt();
        Remap();
        _ = _changed();
    }

    public void ClearOverrides()
    {
        _workspace.Overrides.Clear();
        ForgetBuilt();
        Remap();
        _ = _changed();
    }

    private void ForgetBuilt()
    {
        _workspace.Built.Clear();
        _workspace.GroupModels.Clear();
        _batchRows.Clear();
    }

    /// <summary>Builds a model per group (or per cell without groups) with the rule in the form; it becomes the workspace's rule.</summary>
    public async Task BuildAllAsync()
    {
        if (Expression is null || Report is null) return;
        Building = true;
        Error = null;
        var rule = DensityRule.RelativeTo(string.IsNullOrEmpty(ReferenceGroup) ? null : ReferenceGroup) with
        {
            Exponent = Exponent,
            ClampToPlausibleRange = Clamp,
            CapacitancePf = CapacitancePf,
            TemperatureC = TemperatureC,
        };
        try
        {
            var s = Expression;
            var report = Report;
            var built = await Task.Run(() => s.Dataset.Targets.Select(t => (t, s.Build(report, rule, t))).ToList());
            _workspace.Rule = rule;
            ForgetBuilt();
            foreach (var (target, model) in built)
            {
                var label = target.Group ?? target.CellId!;
                _workspace.Built[label] = model;
                _workspace.GroupModels[label] = model.Document;
            }
        }
        catch (UserInputException e) { Error = e.Message; }
        finally { Building = false; }
        await _changed();
    }

    /// <summary>Makes the built model <paramref name="label"/> the Workbench's model.</summary>
    public void OpenBuilt(string label)
    {
        bool perCell = Expression?.Dataset.Groups is null;
        _workspace.Open(_workspace.GroupModels[label], "built from " + (perCell ? "cell " : "group ") + label, null,
            perCell ? ModelTarget.ForCell(label) : ModelTarget.ForGroup(label));
    }

    /// <summary>Makes the first group's model the Workbench's model, for a comparison of the groups there.</summary>
    public void OpenFirstGroup()
    {
        var first = _workspace.GroupModels.First();
        _workspace.Open(first.Value, "built from group " + first.Key, null, ModelTarget.ForGroup(first.Key));
    }

    /// <summary>Read-outs of every built model, one after another, with progress; cancellable between and within models.</summary>
    public async Task RunBatchAsync()
    {
        _batchCts?.Cancel();
        _batchCts = new CancellationTokenSource();
        var token = _batchCts.Token;
        BatchBusy = true; BatchCancelled = false; BatchDone = 0; BatchTotal = _workspace.GroupModels.Count;
        _batchRows.Clear();
        try
        {
            foreach (var (label, doc) in _workspace.GroupModels.ToList())
            {
                _batchRows[label] = await _runner.ReadoutsAsync(doc, token);
                BatchDone++;
                await _changed();
            }
        }
        catch (OperationCanceledException) { BatchCancelled = true; }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException) { Error = e.Message; }
        finally { BatchBusy = false; }
        await _changed();
    }

    public void CancelBatch()
    {
        _batchCts?.Cancel();
        BatchCancelled = true;
        _ = _changed();
    }

    public void Dispose()
    {
        _batchCts?.Cancel();
        _batchCts?.Dispose();
        CellBatch.Dispose();
    }
}
