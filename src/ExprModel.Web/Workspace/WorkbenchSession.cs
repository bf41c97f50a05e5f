using System.Globalization;
using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Data.Catalog;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench without its page: the open model and the controls, the two-stage live loop (trace and first read-outs
/// side by side, then the f-I-based read-outs; each new setting cancels the run before it), the f-I sweep, variants and
/// sharing. <paramref name="changed"/> is called whenever something shown changed (the page re-renders on it; tests
/// pass a no-op and await <see cref="LiveRun"/>).
/// </summary>
public sealed class WorkbenchSession(ModelRunner runner, WorkspaceState workspace, ChannelCatalog catalog, Func<Task> changed) : IDisposable
{
    private CancellationTokenSource? _liveCts;
    /// <summary>True until the opened model's first read-outs size the step to its rheobase, or the user sets the step.</summary>
    private bool _autoProtocol = true;

    public ModelDocument? Model { get; private set; }
    public string Origin { get; private set; } = "";
    /// <summary>Each channel's density relative to the model's (1 = as expressed), in the model's channel order.</summary>
    public double[] Relative { get; private set; } = [];
    public double TemperatureC { get; private set; }
    public double AreaUm2 { get; private set; }
    public IonConcentrations Ions { get; private set; } = IonConcentrations.Mammalian;
    public double AmplitudeUaPerCm2 { get; private set; } = 10;
    public StepProtocol Protocol { get; private set; } = new();
    public FiProtocol Fi { get; private set; } = new();
    /// <summary>True once the user sets the f-I range; until then the read-outs' own standard sweep is shown.</summary>
    public bool CustomFi { get; private set; }

    public StepView? Step { get; private set; }
    public LiveReadouts Table { get; } = new();
    public IReadOnlyList<FiRow>? FiRows { get; private set; }
    public bool Busy { get; private set; }
    public string? Error { get; set; }

    /// <summary>Counters the page carries as data attributes (tests wait on them) and revisions that tell each plot to redraw.</summary>
    public int TraceCount { get; private set; }
    public int FiCount { get; private set; }
    public int TraceRevision { get; private set; }
    public int FiRevision { get; private set; }
    /// <summary>Revision of the phase-plane and spike-current plots: they follow the voltage trace once the first read-outs are shown.</summary>
    public int ShapeRevision { get; private set; }

    public VariantSet Variants { get; } = new();
    public FiSweepJob FiSweep { get; } = new(runner, changed);

    /// <summary>The latest live update (completed when it ends, however it ends).</summary>
    public Task LiveRun { get; private set; } = Task.CompletedTask;

    /// <summary>Optional measurement hook: told when each live update starts and reaches its trace and first read-outs.</summary>
    public ILiveUpdateObserver? Observer { get; set; }

    /// <summary>The share link and its note (see <see cref="WorkbenchShare"/>).</summary>
    public WorkbenchShare Share { get; } = new(workspace, changed);
    public string? SharedSnapshotId => Share.SnapshotId;
    public string? ShareNote => Share.Note;
    public bool Sharing => Share.InProgress;

    /// <summary>Opens the preset <paramref name="presetId"/> if it names one, else the workspace's model, else Wang and Buzsaki 1996.</summary>
    public void OpenInitial(string? presetId)
    {
        if (presetId is { Length: > 0 } id && catalog.Presets.TryGetValue(id, out var p)) Open(p, "published model " + id, null);
        else if (workspace.Model is { } m) Open(m, workspace.ModelOrigin, workspace.ParentSnapshotId, workspace.ModelTarget);
        else Open(catalog.Preset("wb1996"), "published model wb1996", null);
    }

    /// <summary>Opens "preset:ID" or "group:NAME" (the model picker's values); clears the variants.</summary>
    public void OpenSource(string choice)
    {
        Variants.Clear();
        if (choice.StartsWith("preset:", StringComparison.Ordinal)) Open(catalog.Preset(choice[7..]), "published model " + choice[7..], null);
        else if (choice.StartsWith("group:", StringComparison.Ordinal) && workspace.GroupModels.TryGetValue(choice[6..], out var g))
        {
            var target = workspace.Session?.Dataset.Groups is null ? ModelTarget.ForCell(choice[6..]) : ModelTarget.ForGroup(choice[6..]);
            Open(g, "built from group " + choice[6..], null, target);
        }
    }

    /// <summary>Opens a model file's text; a bad file leaves the open model and sets <see cref="Error"/>.</summary>
    public void Import(string json, string fileName)
    {
        try
        {
            var doc = ModelRunner.Parse(json, fileName);
            runner.Compile(doc);
            Variants.Clear();
            Error = null;
            Open(doc, "imported from " + fileName, null);
        }
        catch (UserInputException e) { Error = e.Message; }
        _ = changed();
    }

    /// <param name="target">The cell or group the model was built for (its recorded values are shown beside it).</param>
    public void Open(ModelDocument model, string from, string? parent, ModelTarget? target = null)
    {
        Model = model;
        Origin = from;
        Relative = model.Channels.Select(c => c.RelativeDensity).ToArray();
        TemperatureC = model.TemperatureC;
        Ions = model.Ions ?? IonConcentrations.Mammalian;
        try { AreaUm2 = model.Cell.ToGeometry().AreaUm2; } catch (ModelFileException e) { Error = e.Message; AreaUm2 = 1000; }
        if (!ReferenceEquals(workspace.Model, model) || workspace.ModelTarget != target) workspace.Open(model, from, parent, target);
        Share.Forget();
        Table.ForgetHint();
        _autoProtocol = true;
        CustomFi = false;
        ScheduleLive();
    }

    /// <summary>The model as the controls set it now.</summary>
    public ModelDocument Current()
    {
        var m = Model!;
        return m with
        {
            Channels = m.Channels.Select((c, i) => c with { RelativeDensity = Relative[i] }).ToArray(),
            TemperatureC = TemperatureC,
            Ions = Ions,
            Cell = new CellGeometryDocument { AreaUm2 = AreaUm2, CapacitanceUfPerCm2 = m.Cell.CapacitanceUfPerCm2 },
        };
    }

    public Geometry Area => new() { AreaUm2 = AreaUm2 > 0 ? AreaUm2 : 1 };

    public void SetRelative(int channel, double relative) { Relative[channel] = relative; ScheduleLive(); }
    public void ResetAll() { Array.Fill(Relative, 1.0); ScheduleLive(); }

    public void SetTemperature(string? text)
    {
        if (!TryNumber(text, out var t) || t < -5 || t > 50) Refuse("Temperature: enter a number between -5 and 50 °C.");
        else { TemperatureC = t; ScheduleLive(); }
    }

    public void SetArea(string? text)
    {
        if (!TryNumber(text, out var a) || a <= 0) Refuse("Membrane area: enter a positive number of µm².");
        else { AreaUm2 = a; ScheduleLive(); }
    }

    /// <summary>Switches stochastic channels on or off for the trace (read-outs stay deterministic).</summary>
    public void SetChannelNoise(bool on)
    {
        Protocol = Protocol with { ChannelNoise = on };
        ScheduleLive(includeFi: false);
    }

    public void SetNoiseSeed(string? text)
    {
        if (!long.TryParse(text, NumberStyles.Integer, CultureInfo.InvariantCulture, out var seed)) Refuse($"seed: '{text}' is not a whole number");
        else { Protocol = Protocol with { NoiseSeed = seed }; ScheduleLive(includeFi: false); }
    }

    public void SetAmplitude(string? text)
    {
        if (!TryNumber(text, out var a)) Refuse("Step: enter a number of µA/cm².");
        else { AmplitudeUaPerCm2 = a; _autoProtocol = false; ScheduleLive(includeFi: false); }
    }

    public void SetIon(string? text, Func<IonConcentrations, double, IonConcentrations> set)
    {
        if (!TryNumber(text, out var x) || x <= 0) Refuse("Ionic concentrations must be positive numbers (mM).");
        else { Ions = set(Ions, x); ScheduleLive(); }
    }

    public void SetFi(string? text, Func<FiProtocol, double, FiProtocol> set)
    {
        if (!TryNumber(text, out var x)) { Refuse("f-I range: enter numbers."); return; }
        var next = set(Fi, x);
        if (next.Problem() is { } p) { Refuse(p); return; }
        Fi = next; Error = null; CustomFi = true;
        StartFiSweep(Current());
        _ = changed();
    }

    /// <summary>Runs the user's f-I sweep again (after a cancel).</summary>
    public void RunFiAgain() => StartFiSweep(Current());

    /// <summary>Shows <paramref name="message"/> to the user (a value refused, a download that failed).</summary>
    public void Refuse(string message)
    {
        Error = message;
        _ = changed();
    }

    private static bool TryNumber(string? text, out double x) =>
        double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out x) && double.IsFinite(x);

    private void ScheduleLive(bool includeFi = true)
    {
        Observer?.Started();
        _liveCts?.Cancel();
        _liveCts?.Dispose();
        _liveCts = new CancellationTokenSource();
        Share.ForgetNote();
        Protocol = Protocol with { AmplitudeUaPerCm2 = AmplitudeUaPerCm2 };
        LiveRun = RunLive(_liveCts.Token, includeFi);
    }

    private async Task RunLive(CancellationToken token, bool includeFi)
    {
        try
        {
            // No debounce: each new setting cancels the run before it (stale work stops at its next check).
            await Task.Yield();
            token.ThrowIfCancellationRequested();
            var doc = Current();
            Busy = true;
            await changed();
            // The trace and the read-outs' first stage run side by side; each is shown as soon as it is done, and the
            // second stage (f-I curve, class, adaptation) follows. The previous rheobase seeds this one's search.
            var firstTask = runner.FirstReadoutsAsync(doc, Table.Hint, token);
            Step = await runner.StepAsync(doc, Protocol, token);
            token.ThrowIfCancellationRequested();
            Observer?.TraceReady();
            TraceCount++;
            TraceRevision++;
            await changed();
            var set = await firstTask;
            token.ThrowIfCancellationRequested();
            Observer?.FirstReadoutsReady();
            Table.Show(set);
            Error = null;
            await changed();
            // The phase plane and the spike currents come from the same trace; drawn after the read-outs so the table is not held up.
            ShapeRevision = TraceRevision;
            await changed();
            if (_autoProtocol && set.Value("rheobase") is > 0 and var rb)
            {
                // First read-outs of a newly opened model: size the step and the f-I range to this cell.
                _autoProtocol = false;
                AmplitudeUaPerCm2 = StepSizing.FromRheobase(rb);
                Protocol = Protocol with { AmplitudeUaPerCm2 = AmplitudeUaPerCm2 };
                Step = await runner.StepAsync(doc, Protocol, token);
                TraceCount++;
                TraceRevision++;
                ShapeRevision = TraceRevision;
                await changed();
            }
            if (!set.IsComplete)
            {
                set = await runner.CompleteReadoutsAsync(doc, set, token);
                token.ThrowIfCancellationRequested();
                Table.Show(set);
            }
            if (!CustomFi && includeFi)
            {
                // The read-outs already measured the standard f-I sweep; show it rather than running another.
                FiSweep.Supersede();
                ShowFi(set.Fi);
                Fi = Fi with
                {
                    FromUaPerCm2 = set.Fi.Count > 0 ? set.Fi[0].CurrentUaPerCm2 : Fi.FromUaPerCm2,
                    ToUaPerCm2 = set.Fi.Count > 0 ? set.Fi[^1].CurrentUaPerCm2 : Fi.ToUaPerCm2,
                    Steps = Math.Max(2, set.Fi.Count),
                };
            }
            Busy = false;
            await changed();
            if (includeFi && CustomFi) StartFiSweep(doc);
        }
        catch (OperationCanceledException) { }
        catch (Exception e) when (e is UserInputException or SimulationTimeoutException)
        {
            if (token.IsCancellationRequested) return;
            Error = e.Message;
            Busy = false;
            await changed();
        }
    }

    private void ShowFi(IReadOnlyList<FiRow> rows)
    {
        FiRows = rows;
        FiCount++;
        FiRevision++;
    }

    private void StartFiSweep(ModelDocument doc) => FiSweep.Start(doc, Fi, ShowFi, message => Error = message);

    /// <summary>True when the live read-outs are complete and a trace is shown: what a variant needs.</summary>
    public bool CanPin => !Variants.IsFull && Step is not null && Table.Pending.Count == 0;

    public void PinVariant()
    {
        if (Step is null || !Table.IsComplete || Variants.IsFull) return;
        var changedChannels = Model!.Channels.Select((c, i) => Relative[i] == 1 ? null : $"{c.Entry} {Relative[i] * 100:0}%").Where(s => s is not null);
        var name = $"#{Variants.Count + 1} " + (changedChannels.Any() ? string.Join(", ", changedChannels) : "as expressed");
        Variants.Add(name, Step, FiRows, Table.Rows!, 48);
        RedrawWithVariants();
        _ = changed();
    }

    public void RemoveVariant(Variant v)
    {
        Variants.Remove(v);
        RedrawWithVariants();
        _ = changed();
    }

    /// <summary>Pins the first groups' models built from the user's data as variants (see <see cref="VariantSet.CompareGroupsAsync"/>).</summary>
    public Task CompareGroupsAsync() =>
        Variants.CompareGroupsAsync(runner, workspace.GroupModels, Protocol, CustomFi ? Fi : null, changed, RedrawWithVariants, m => Error = m);

    private void RedrawWithVariants()
    {
        TraceRevision++;
        ShapeRevision = TraceRevision;
        FiRevision++;
    }

    /// <summary>Stores the current model as a share link (see <see cref="WorkbenchShare.ShareAsync"/>).</summary>
    public Task ShareAsync(SnapshotService snapshots, string notes, bool storeExpression) =>
        Share.ShareAsync(this, snapshots, notes, storeExpression);

    /// <summary>Shows the read-outs a share link stored for <paramref name="model"/> in place of the live ones.</summary>
    internal void ShowStored(ModelDocument model, ReadoutSet stored)
    {
        Table.Show(stored);
        if (!CustomFi) ShowFi(stored.Fi);
        runner.Adopt(model, stored);
    }

    public void Dispose()
    {
        _liveCts?.Cancel();
        _liveCts?.Dispose();
        FiSweep.Dispose();
        Variants.Dispose();
    }
}
