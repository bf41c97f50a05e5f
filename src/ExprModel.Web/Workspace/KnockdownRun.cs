using System.Globalization;
using ExprModel.Core.Cell;
using ExprModel.Core.Models;
using ExprModel.Core.Perturbation;
using ExprModel.Web.Export;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench's virtual knock-down: every entry of the model, or every gene when the model was built from expression,
/// at one level (the library's <see cref="Knockdown"/> and <see cref="GeneKnockdowns"/>), ranked per read-out.
/// </summary>
public sealed class KnockdownRun(ModelRunner runner, SimulationGate gate, Func<ModelDocument?> current, Func<Task> changed) : IDisposable
{
    /// <summary>The read-out "which genes set the rheobase" ranks by.</summary>
    public const string Rheobase = "rheobase";

    public BackgroundJob Job { get; } = new(gate, changed);
    public KnockdownReport? Report { get; private set; }
    /// <summary>The model the report was measured on (its JSON), to tell when the controls have moved on.</summary>
    public string? MeasuredModelJson { get; private set; }
    public string MeasuredModelName { get; private set; } = "";
    /// <summary>What the report knocked down: channel entries or genes.</summary>
    public KnockdownKind Kind { get; private set; }
    /// <summary>The read-out the tornado plot and the table rank by; null = every read-out in the table.</summary>
    public string? Readout { get; set; } = Rheobase;
    /// <summary>Fraction of each density (or expression) left: 0 = removed, 0.5 = half.</summary>
    public double Level { get; private set; } = 0.5;
    /// <summary>Bars drawn in the tornado plot (the table has every target).</summary>
    public int TornadoBars { get; set; } = 15;

    /// <summary>True when the model records the genes it was built from (its derivation), so genes can be knocked down.</summary>
    public bool HasGenes(ModelDocument doc)
    {
        if (_genesOf is { } known && ReferenceEquals(known.Doc.Derivation, doc.Derivation) && known.Doc.Channels.Count == doc.Channels.Count) return known.Has;
        bool has;
        if (doc.Derivation is null) has = false;
        else
        {
            try { has = GeneKnockdowns.Targets(doc, runner.Compile(doc).Model, 0).Count > 0; }
            catch (Exception e) when (e is ArgumentException or UserInputException) { has = false; }
        }
        _genesOf = (doc, has);
        return has;
    }

    private (ModelDocument Doc, bool Has)? _genesOf;

    /// <summary>Sets the level from a percentage typed by the user (0 to 100); false with nothing changed for anything else.</summary>
    public bool SetLevelPercent(string? text)
    {
        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out var pct) || !(pct is >= 0 and <= 100)) return false;
        Level = pct / 100;
        return true;
    }

    public void SetLevel(double level) => Level = level is >= 0 and <= 1 ? level
        : throw new ArgumentOutOfRangeException(nameof(level), "a knock-down level lies in [0, 1].");

    /// <summary>"Which genes set the rheobase": genes when the model has them, else entries, ranked by rheobase.</summary>
    public void WhichSetRheobase()
    {
        Readout = Rheobase;
        if (current() is { } doc) Start(HasGenes(doc) ? KnockdownKind.Gene : KnockdownKind.Channel);
    }

    /// <summary>Knocks down every target of <paramref name="kind"/> at <see cref="Level"/> on the model as the controls set it now.</summary>
    public void Start(KnockdownKind kind)
    {
        if (current() is not { } doc) return;
        double level = Level;
        Job.Start((checkpoint, token) =>
        {
            var cell = runner.Compile(doc).Model;
            var targets = kind == KnockdownKind.Gene ? GeneKnockdowns.Targets(doc, cell, level)
                : KnockdownTarget.Channels(new DensityProbe(cell, Knockdown.DefaultSettings).ChannelLabels, level);
            Job.Report(0, targets.Count);
            return Knockdown.Run(cell, targets, level, progress: (done, all) => { Job.Report(done, all); checkpoint(); }, cancel: token);
        }, report =>
        {
            Report = report;
            Kind = kind;
            MeasuredModelJson = doc.ToJson();
            MeasuredModelName = doc.Name;
        });
    }

    /// <summary>The rows the table shows: the chosen read-out's targets ranked, or every read-out's.</summary>
    public IReadOnlyList<KnockdownChange> Rows() =>
        Report is null ? [] : Readout is { } r ? Report.Ranked(r) : Report.AllRanked();

    /// <summary>The tornado plot's bars for the chosen read-out (the largest effects, at most <see cref="TornadoBars"/>).</summary>
    public TornadoChart? Tornado() =>
        Report is null || Readout is null ? null : TornadoChart.From(Report.Ranked(Readout), Readout, TornadoBars);

    /// <summary>Every change as CSV (the same columns as `exprmodel knockdown --format csv`), with the caution; null before a run.</summary>
    public DownloadFile? Csv()
    {
        if (Report is null) return null;
        var notes = new[]
        {
            ResearchCaution.Text, $"model: {MeasuredModelName}",
            $"level {Report.Level.ToString(CultureInfo.InvariantCulture)} of each "
                + $"{(Kind == KnockdownKind.Gene ? "gene's expression" : "channel's density")}; read-outs with "
                + $"{ReadoutScales.Percent(Knockdown.DefaultSettings.RheobaseRelativeTolerance)} rheobase grid",
        }.Concat(Report.Failures.Select(f => $"{f.Key}: {f.Value}"));
        var csv = new ExprModel.Core.Export.CsvTable(notes,
            ["readout", "unit", "target", "kind", "intact", "knocked_down", "change", "relative_change", "lost"]);
        foreach (var c in Report.AllRanked())
            csv.Row([c.Readout, c.Unit, c.Target, c.Kind.ToString().ToLowerInvariant(), c.Intact, c.KnockedDown, c.Change, c.RelativeChange, c.Lost]);
        return new("knockdown.csv", "text/csv", csv.ToString());
    }

    public void Dispose() => Job.Dispose();
}
