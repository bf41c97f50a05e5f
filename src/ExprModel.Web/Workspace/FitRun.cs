using System.Globalization;
using ExprModel.Core.Models;
using ExprModel.Core.Perturbation;
using ExprModel.Web.Export;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench's "fit to recording": typed (or pre-filled) targets, the prior and the starts, and the library's
/// <see cref="DensityFit"/> on the model as the controls set it now; the fitted model opens on the Workbench or downloads.
/// </summary>
public sealed class FitRun(ModelRunner runner, SimulationGate gate, Func<ModelDocument?> current, Action<ModelDocument, string> open,
    Func<Task> changed) : IDisposable
{
    public BackgroundJob Job { get; } = new(gate, changed);
    public List<FitTargetRow> Rows { get; } = [new()];
    /// <summary>True when the rows came from <see cref="Prefill"/> (recorded read-outs of the cell or group).</summary>
    public bool Prefilled { get; private set; }
    /// <summary>Prior width in ln(relative density), as typed; ignored with <see cref="NoPrior"/>.</summary>
    public string PriorWidthText { get; set; } = Math.Log(2).ToString("0.###", CultureInfo.InvariantCulture);
    public bool NoPrior { get; set; }
    public int Starts { get; set; } = 2;
    public int Seed { get; set; } = 1;
    /// <summary>A target or setting the user must fix before the fit can run; null when all is well.</summary>
    public string? InputError { get; private set; }

    public FitResult? Result { get; private set; }
    public string? MeasuredModelJson { get; private set; }
    public string MeasuredOrigin { get; private set; } = "";
    /// <summary>The name the fitted model was opened under on the Workbench; null until it is.</summary>
    public string? OpenedAs { get; private set; }

    /// <summary>The step duration the recorded values were measured on (ms), when they came from sweeps; the fit then
    /// measures the model on the same steps.</summary>
    public double? RecordedStepDurationMs { get; private set; }

    /// <summary>Replaces the rows with recorded read-outs (the page labels them "pre-filled from recordings").</summary>
    /// <param name="stepDurationMs">The recorded steps' duration when the values came from sweeps.</param>
    public void Prefill(IEnumerable<FitTarget> targets, double? stepDurationMs = null)
    {
        var rows = targets.Select(t => new FitTargetRow
        {
            Readout = t.Readout,
            Unit = t.Unit,
            Value = t.Value.ToString("R", CultureInfo.InvariantCulture),
            Scale = t.Scale.ToString("R", CultureInfo.InvariantCulture),
        }).ToList();
        if (rows.Count == 0) return;
        Rows.Clear();
        Rows.AddRange(rows);
        Prefilled = true;
        RecordedStepDurationMs = stepDurationMs;
        _ = changed();
    }

    public void AddRow() => Rows.Add(new FitTargetRow());

    public void RemoveRow(FitTargetRow row)
    {
        Rows.Remove(row);
        if (Rows.Count == 0) Rows.Add(new FitTargetRow());
    }

    /// <summary>Chooses a row's read-out and sets its unit to the read-out's own.</summary>
    public static void Choose(FitTargetRow row, string readout)
    {
        row.Readout = readout;
        row.Unit = ReadoutValues.UnitOf(readout) ?? "";
    }

    /// <summary>The filled rows as the library's targets (blank rows are skipped); errors name the row.</summary>
    /// <exception cref="ArgumentException">A row the library's reader refuses, or no target at all.</exception>
    public IReadOnlyList<FitTarget> Targets()
    {
        var targets = new List<FitTarget>();
        for (int i = 0; i < Rows.Count; i++)
        {
            var r = Rows[i];
            if (r.Readout.Length == 0 && r.Value.Trim().Length == 0) continue;
            string where = $"target row {i + 1}";
            if (r.Readout.Length == 0) throw new ArgumentException($"{where}: choose a read-out.");
            double? scale = null;
            if (r.Scale.Trim().Length > 0)
            {
                if (!double.TryParse(r.Scale, NumberStyles.Float, CultureInfo.InvariantCulture, out var s) || !(s > 0) || double.IsInfinity(s))
                    throw new ArgumentException($"{where}: the scale '{r.Scale}' must be a positive number (or blank for the default).");
                scale = s;
            }
            try { targets.Add(FitTargetReader.ParseTyped($"{r.Readout}={r.Value.Trim()}{r.Unit.Trim()}", scale)); }
            catch (ArgumentException e) { throw new ArgumentException($"{where}: {e.Message}"); }
        }
        if (targets.Count == 0) throw new ArgumentException("Give at least one recorded read-out (read-out, value, unit).");
        return targets;
    }

    /// <summary>The settings as typed; errors name the field.</summary>
    public FitSettings Settings()
    {
        double? width = null;
        if (!NoPrior)
        {
            if (!double.TryParse(PriorWidthText, NumberStyles.Float, CultureInfo.InvariantCulture, out var w) || !(w > 0) || double.IsInfinity(w))
                throw new ArgumentException($"Prior width: '{PriorWidthText}' must be a positive number of ln units (0.69 = two-fold), or tick \"no prior\".");
            width = w;
        }
        var settings = FitSettings.Default with { PriorWidth = width, Starts = Starts, Seed = Seed };
        // Values measured from recorded sweeps are compared with the model on steps of the recording's duration.
        if (Prefilled && RecordedStepDurationMs is { } stepMs) settings = settings with { Readouts = settings.Readouts with { StepDurationMs = stepMs } };
        if (settings.Problem() is { } p) throw new ArgumentException("Fit settings: " + p);
        return settings;
    }

    /// <summary>Fits the model as the controls set it now; a bad target or setting sets <see cref="InputError"/> instead.</summary>
    public void Start(string origin)
    {
        if (current() is not { } doc) return;
        IReadOnlyList<FitTarget> targets;
        FitSettings settings;
        try { targets = Targets(); settings = Settings(); InputError = null; }
        catch (ArgumentException e) { InputError = e.Message; _ = changed(); return; }
        Job.Start((checkpoint, token) =>
        {
            var cell = runner.Compile(doc).Model;
            return DensityFit.Run(doc, cell, targets, settings, p =>
            {
                Job.Report(p.StartsDone, p.Starts, FormattableString.Invariant($"{p.Evaluations} model evaluations, best objective {p.BestObjective:G3}"));
                checkpoint();
            }, token);
        }, fit =>
        {
            Result = fit;
            OpenedAs = null;
            MeasuredModelJson = doc.ToJson();
            MeasuredOrigin = origin;
        });
    }

    /// <summary>Opens the fitted model on the Workbench as a new model whose origin says it was fitted.</summary>
    public void OpenFitted()
    {
        if (Result is null) return;
        OpenedAs = Result.Document.Name;
        open(Result.Document, $"fitted to {Result.Residuals.Count} recorded read-out(s) from {(MeasuredOrigin.Length > 0 ? MeasuredOrigin : "the model")}");
    }

    /// <summary>The fitted model file (entries pinned, the caution and the fit's record in it); null before a fit.</summary>
    /// <exception cref="UserInputException">An entry does not resolve.</exception>
    public DownloadFile? FittedModelFile()
    {
        if (Result is null) return null;
        var doc = runner.Pin(Result.Document) with { Caution = ResearchCaution.Text };
        var stem = new string(doc.Name.Select(c => char.IsLetterOrDigit(c) ? c : '-').ToArray()).Trim('-').ToLowerInvariant();
        return new(stem + ".model.json", "application/json", doc.ToJson());
    }

    public void Dispose() => Job.Dispose();
}
