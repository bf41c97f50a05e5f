using System.CommandLine;
using System.Text.Json;
using System.Text.Json.Nodes;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Core.Recordings;

namespace ExprModel.Cli.Commands;

/// <summary>exprmodel recording features: read-outs measured from recorded current-clamp sweeps (NWB or CSV).</summary>
public static class RecordingCommands
{
    /// <summary>Units that name no quantity to append to a column name (ratios, flags, counts).</summary>
    private static readonly HashSet<string> Unitless = ["fraction", "0/1", "1 or 2", "last/first ISI", "mean normalised ISI change", "count"];

    public static Command Create(CliContext ctx)
    {
        var recording = new Command("recording", "Read recorded current-clamp sweeps and measure them.");
        var features = new Command("features", "Read-outs per recorded cell (the simulator's definitions, measured on the sweeps): rest, input resistance, " +
            "time constant, sag, rheobase with the family's step spacing, spike shape, f-I gain, adaptation.");
        var path = new Argument<string>("path")
        {
            Description = "An NWB file (.nwb), a trace table (.csv/.tsv/.txt: time, V, I with units in the headers; " +
            "optional sweep column) or a directory of them."
        };
        var format = new Option<string>("--format") { Description = "csv or json", DefaultValueFactory = _ => "csv" };
        var output = new Option<string?>("--out") { Description = "Write to this file (default: standard output)." };
        features.Arguments.Add(path);
        features.Options.Add(format);
        features.Options.Add(output);
        // Accepted like on every command, so scripts can pass it everywhere; measuring recordings needs no catalog.
        var db = new Option<string?>("--db") { Description = "Catalog database file (not needed to measure recordings)." };
        features.Options.Add(db);
        features.SetAction(p =>
        {
            string fmt = p.GetValue(format)!;
            if (fmt is not ("csv" or "json")) throw new CliException($"--format: '{fmt}' is not csv or json.");
            IReadOnlyList<RecordedCell> cells;
            try { cells = RecordingReader.Read(p.GetValue(path)!); }
            catch (RecordingFormatException e) { throw new CliException(e.Message); }
            var measured = cells.Select(c => RecordingFeatures.Measure(c)).ToArray();
            ctx.Emit(fmt == "json" ? Json(measured) : Csv(measured), p.GetValue(output));
            return 0;
        });
        recording.Subcommands.Add(features);
        recording.Subcommands.Add(OverlayCommand(ctx));
        return recording;
    }

    private static Command OverlayCommand(CliContext ctx)
    {
        var c = new Command("overlay", "A recorded sweep and a model's response to the same step (same onset, duration and holding current; pA converted " +
            "with the model's area) on one time base, as CSV.");
        var path = new Argument<string>("path") { Description = "An NWB file, a trace table or a directory of them." };
        var model = new Option<string?>("--model") { Description = "Model file (exprmodel JSON), e.g. from exprmodel build --cell ID." };
        var preset = new Option<string?>("--preset") { Description = "A published preset instead of a model file." };
        var cell = new Option<string?>("--cell") { Description = "The recorded cell (default: the only one in the path)." };
        var sweep = new Option<int?>("--sweep") { Description = "Sweep number (default: the recorded rheobase sweep, else the largest step)." };
        var output = new Option<string?>("--out") { Description = "CSV file to write (default: standard output)." };
        var db = new Option<string?>("--db") { Description = "Catalog database file." };
        c.Arguments.Add(path);
        foreach (var o in new Option[] { model, preset, cell, sweep, output, db }) c.Options.Add(o);
        c.SetAction(p =>
        {
            ctx.DatabasePath = p.GetValue(db);
            var (file, presetId) = (p.GetValue(model), p.GetValue(preset));
            if ((file is null) == (presetId is null)) throw new CliException("Give the model with --model FILE or --preset ID (exactly one).");
            if (file is not null && !File.Exists(file)) throw new CliException($"{file}: no such model file.");
            IReadOnlyList<RecordedCell> cells;
            try { cells = RecordingReader.Read(p.GetValue(path)!); }
            catch (RecordingFormatException e) { throw new CliException(e.Message); }
            var id = p.GetValue(cell);
            var recorded = id is null
                ? cells.Count == 1 ? cells[0] : throw new CliException($"{p.GetValue(path)} holds {cells.Count} cells; name one with --cell " +
                    $"({string.Join(", ", cells.Select(x => x.CellId))}).")
                : cells.FirstOrDefault(x => x.CellId == id) ?? throw new CliException($"{p.GetValue(path)}: no recorded cell '{id}' (cells: " +
                    $"{string.Join(", ", cells.Select(x => x.CellId))}).");
            var doc = presetId is not null ? ctx.Catalog.Preset(presetId) : ModelDocument.Parse(File.ReadAllText(file!), file!);
            TraceOverlay overlay;
            try { overlay = TraceOverlay.Of(recorded, p.GetValue(sweep), ctx.Catalog.BuildCell(doc)); }
            catch (ArgumentException e) { throw new CliException(e.Message); }
            catch (SimulationBlowUpException e) { throw new CliException($"model {doc.Name}: {e.Message}"); }
            var csv = new CsvTable(
                [ResearchCaution.Text, $"model: {doc.Name}; recorded: cell {overlay.CellId}, sweep {overlay.SweepNumber} ({recorded.Source})",
                 FormattableString.Invariant($"step {overlay.Step.AmplitudePa:0.###} pA ({overlay.StepUaPerCm2:0.####} uA/cm2 on the model's area) from ") +
                     FormattableString.Invariant($"{overlay.Step.OnsetMs:0.###} ms for {overlay.Step.DurationMs:0.###} ms, holding ") +
                     FormattableString.Invariant($"{overlay.Step.HoldingPa:0.###} pA"),
                 .. overlay.Notes],
                ["time_ms", "recorded_mv", "predicted_mv", "command_pa"]);
            for (int i = 0; i < overlay.TimeMs.Length; i++) csv.Row(overlay.TimeMs[i], overlay.RecordedMv[i], overlay.PredictedMv[i], overlay.CommandPa[i]);
            ctx.Emit(csv.ToString(), p.GetValue(output));
            return 0;
        });
        return c;
    }

    /// <summary>Rows whose unit is a current density: a recording has no cell area, so they are always empty and left out.</summary>
    private static IEnumerable<(string Name, string Unit, double? Value)> Shown(RecordedReadouts r) =>
        r.Rows().Where(x => !x.Unit.Contains("cm2", StringComparison.Ordinal));

    /// <summary>Column name in the batch table's style: name_unit in lower case (resting_potential_mv, rheobase_absolute_pa).</summary>
    public static string Column(string name, string unit) =>
        Unitless.Contains(unit) ? name : $"{name}_{unit.ToLowerInvariant().Replace("/", "_per_").Replace(' ', '_')}";

    public static string Csv(IReadOnlyList<RecordedReadouts> measured)
    {
        var first = measured.Count > 0 ? Shown(measured[0]).ToArray() : Shown(EmptyShape()).ToArray();
        var header = new List<string> { "item_index", "item", "source" };
        header.AddRange(first.Select(x => Column(x.Name, x.Unit)));
        header.Add("notes");
        var csv = new CsvTable(
            ["Recorded read-outs: measurements from current-clamp sweeps, not model predictions. Definitions as the simulator's (DEVELOPERS.md, Read-outs " +
                "and Recordings).",
             "rheobase_absolute_pa is the smallest recorded step that spikes; the true rheobase lies within rheobase_step_spacing_pa below it."],
            header);
        for (int i = 0; i < measured.Count; i++)
        {
            var r = measured[i];
            var row = new List<object?> { i, r.CellId, r.Source };
            row.AddRange(Shown(r).Select(x => (object?)x.Value));
            row.Add(string.Join(" | ", r.Readouts.Notes));
            csv.Row([.. row]);
        }
        return csv.ToString();
    }

    public static string Json(IReadOnlyList<RecordedReadouts> measured)
    {
        var cells = new JsonArray();
        foreach (var r in measured)
        {
            var values = new JsonObject();
            foreach (var (name, unit, value) in Shown(r))
                values[name] = new JsonObject { ["value"] = value is { } v && double.IsFinite(v) ? v : null, ["unit"] = unit };
            cells.Add(new JsonObject
            {
                ["cell"] = r.CellId,
                ["source"] = r.Source,
                ["readouts"] = values,
                ["fi_curve"] = new JsonArray(r.FiCurve.Select(p => (JsonNode)new JsonObject
                {
                    ["sweep"] = p.SweepNumber,
                    ["amplitude_pa"] = p.CurrentPa,
                    ["spike_count"] = p.Rates.SpikesInStep,
                    ["whole_step_rate_hz"] = p.Rates.WholeStepRateHz,
                    ["first_isi_rate_hz"] = p.Rates.FirstIsiRateHz,
                    ["late_rate_hz"] = p.Rates.LateRateHz,
                }).ToArray()),
                ["notes"] = new JsonArray(r.Readouts.Notes.Select(n => (JsonNode)JsonValue.Create(n)!).ToArray()),
            });
        }
        var root = new JsonObject { ["about"] = "Recorded read-outs: measurements from current-clamp sweeps, not model predictions.", ["cells"] = cells };
        return root.ToJsonString(new JsonSerializerOptions { WriteIndented = true }) + "\n";
    }

    private static RecordedReadouts EmptyShape() => new() { CellId = "", Source = "", Readouts = new() };
}
