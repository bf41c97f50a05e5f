using System.CommandLine;
using System.Text.Json;
using System.Text.Json.Nodes;
using ExprModel.Core.Export;
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
        var features = new Command("features", "Read-outs per recorded cell (the simulator's definitions, measured on the sweeps): rest, input resistance, time constant, sag, rheobase with the family's step spacing, spike shape, f-I gain, adaptation.");
        var path = new Argument<string>("path") { Description = "An NWB file (.nwb), a trace table (.csv/.tsv/.txt: time, V, I with units in the headers; optional sweep column) or a directory of them." };
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
        return recording;
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
            ["Recorded read-outs: measurements from current-clamp sweeps, not model predictions. Definitions as the simulator's (DEVELOPERS.md, Read-outs and Recordings).",
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
                    ["sweep"] = p.SweepNumber, ["amplitude_pa"] = p.CurrentPa, ["spike_count"] = p.Rates.SpikesInStep,
                    ["whole_step_rate_hz"] = p.Rates.WholeStepRateHz, ["first_isi_rate_hz"] = p.Rates.FirstIsiRateHz, ["late_rate_hz"] = p.Rates.LateRateHz,
                }).ToArray()),
                ["notes"] = new JsonArray(r.Readouts.Notes.Select(n => (JsonNode)JsonValue.Create(n)!).ToArray()),
            });
        }
        var root = new JsonObject { ["about"] = "Recorded read-outs: measurements from current-clamp sweeps, not model predictions.", ["cells"] = cells };
        return root.ToJsonString(new JsonSerializerOptions { WriteIndented = true }) + "\n";
    }

    private static RecordedReadouts EmptyShape() => new() { CellId = "", Source = "", Readouts = new() };
}
