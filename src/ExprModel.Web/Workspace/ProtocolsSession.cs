using System.Globalization;
using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;
using ExprModel.Web.Export;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench's protocols area without its components: the chosen protocol and its settings as typed, an uploaded
/// waveform, and the run as a <see cref="BackgroundJob"/> on the model as the controls set it when Run is pressed. The
/// protocol last run is kept in <see cref="WorkspaceState.Injected"/>, so a share link stores it and opening the link
/// in the Workbench restores it. Tests drive it without a renderer and await <see cref="BackgroundJob.Running"/>.
/// </summary>
public sealed class ProtocolsSession : IDisposable
{
    private readonly ModelRunner _runner;
    private readonly WorkbenchSession _workbench;
    private readonly WorkspaceState _workspace;
    private readonly Func<Task> _changed;
    private readonly Dictionary<string, Dictionary<string, string>> _texts = [];

    public ProtocolsSession(ModelRunner runner, SimulationGate gate, WorkbenchSession workbench, WorkspaceState workspace, Func<Task> changed)
    {
        _runner = runner;
        _workbench = workbench;
        _workspace = workspace;
        _changed = changed;
        Job = new BackgroundJob(gate, changed);
        foreach (var (kind, _) in ProtocolForms.Kinds)
            _texts[kind] = ProtocolForms.Fields(kind).ToDictionary(f => f.Key, f => f.Default.ToString("R", CultureInfo.InvariantCulture));
        if (workspace.Injected is { } stored) Restore(stored);
    }

    public BackgroundJob Job { get; }
    /// <summary>The protocol whose form is shown (one of <see cref="ProtocolForms.Kinds"/>).</summary>
    public string Kind { get; private set; } = ProtocolForms.Pulse;
    /// <summary>A setting or upload the user must fix; null when all is well.</summary>
    public string? InputError { get; private set; }
    /// <summary>The uploaded waveform (uA/cm2) and its file name; null before an upload.</summary>
    public WaveformCurrent? Waveform { get; private set; }
    public string? WaveformName { get; private set; }
    /// <summary>The unit the uploaded file's current column is in: density (uA/cm2), pA or nA.</summary>
    public string WaveformUnit { get; set; } = "pA";

    public ProtocolOutcome? Result { get; private set; }
    /// <summary>The protocol and the model JSON the result was measured on.</summary>
    public InjectedProtocol? MeasuredProtocol { get; private set; }
    public string? MeasuredModelJson { get; private set; }

    /// <summary>True when the result was measured on another model or other control settings than the ones now set.</summary>
    public bool IsStale => MeasuredModelJson is not null && _workbench.Model is not null && _workbench.Current().ToJson() != MeasuredModelJson;

    public void Show(string kind)
    {
        ProtocolForms.Fields(kind);
        Kind = kind;
        InputError = null;
    }

    public string Text(string key) => _texts[Kind].TryGetValue(key, out var t) ? t : "";

    public void SetText(string key, string? text) => _texts[Kind][key] = text?.Trim() ?? "";

    /// <summary>Reads an uploaded waveform (time in ms, current in <see cref="WaveformUnit"/>); a bad file sets <see cref="InputError"/>
    /// naming its line and column and keeps the waveform before it.</summary>
    public void Upload(string fileName, string text)
    {
        try
        {
            var unit = CurrentUnits.Parse(WaveformUnit);
            var area = _workbench.Area;
            Waveform = WaveformReader.Read(text, fileName, v => CurrentUnits.ToDensity(v, unit, area));
            WaveformName = fileName;
            InputError = null;
        }
        catch (Exception e) when (e is WaveformFormatException or ArgumentException) { InputError = e.Message; }
        _ = _changed();
    }

    /// <summary>An upload the browser could not deliver.</summary>
    public void UploadFailed(string message)
    {
        InputError = message;
        _ = _changed();
    }

    /// <summary>The protocol as the form sets it now.</summary>
    /// <exception cref="ArgumentException">A setting that is not a number within its bounds (the message names it).</exception>
    public InjectedProtocol Chosen()
    {
        var values = new Dictionary<string, double>();
        string label = ProtocolForms.LabelOf(Kind);
        foreach (var f in ProtocolForms.Fields(Kind))
        {
            string text = Text(f.Key);
            if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) || !double.IsFinite(v))
                throw new ArgumentException($"{label}, {f.Label}: '{text}' is not a number.");
            if (v < f.Min || v > f.Max)
                throw new ArgumentException(string.Create(CultureInfo.InvariantCulture, $"{label}, {f.Label}: {v} {f.Unit} is outside {f.Min} to {f.Max}."));
            if (f.Whole && v != Math.Floor(v)) throw new ArgumentException($"{label}, {f.Label}: '{text}' must be a whole number.");
            values[f.Key] = v;
        }
        if (Kind == ProtocolForms.Waveform && Waveform is null) throw new ArgumentException($"{label}: upload a file of time (ms) and current first.");
        return new InjectedProtocol
        {
            Kind = Kind,
            Values = values,
            WaveformName = Kind == ProtocolForms.Waveform ? WaveformName : null,
            WaveformTimesMs = Kind == ProtocolForms.Waveform ? [.. Waveform!.TimesMs] : null,
            WaveformUaPerCm2 = Kind == ProtocolForms.Waveform ? [.. Waveform!.DensitiesUaPerCm2] : null,
        };
    }

    /// <summary>Runs the chosen protocol on the model as the controls set it now; a bad setting sets <see cref="InputError"/> instead.</summary>
    public void Start()
    {
        if (_workbench.Model is null) return;
        InjectedProtocol protocol;
        try { protocol = Chosen(); InputError = null; }
        catch (ArgumentException e) { InputError = e.Message; _ = _changed(); return; }
        var doc = _workbench.Current();
        _workspace.Injected = protocol;
        Job.Start((checkpoint, token) =>
        {
            var cell = _runner.Compile(doc);
            var outcome = ProtocolRuns.Run(cell, doc.Name, protocol, token);
            checkpoint();
            return outcome;
        }, outcome =>
        {
            Result = outcome;
            MeasuredProtocol = protocol;
            MeasuredModelJson = doc.ToJson();
        });
    }

    /// <summary>Shows a stored protocol's form with its settings (a share link opened in the Workbench).</summary>
    public void Restore(InjectedProtocol stored)
    {
        if (!ProtocolForms.Kinds.Any(k => k.Kind == stored.Kind)) return;
        Kind = stored.Kind;
        foreach (var (key, v) in stored.Values)
            if (_texts[Kind].ContainsKey(key)) _texts[Kind][key] = v.ToString("R", CultureInfo.InvariantCulture);
        if (stored.WaveformTimesMs is { Length: >= 2 } t && stored.WaveformUaPerCm2 is { } i && i.Length == t.Length)
        {
            Waveform = new WaveformCurrent(t, i);
            WaveformName = stored.WaveformName ?? "stored waveform";
        }
    }

    /// <summary>The last result's CSV (the library's writer: caution and model name first); null before a run.</summary>
    public DownloadFile? Csv() => Result is null ? null : new(Result.CsvName, "text/csv", Result.CsvText);

    public void Dispose() => Job.Dispose();
}
