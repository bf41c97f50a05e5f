using System.CommandLine;
using System.Globalization;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Core.Recordings;

namespace ExprModel.Cli.Commands;

/// <summary>exprmodel compare: every prediction held against the read-outs recorded from the same cells.</summary>
public static class CompareCommand
{
    public static Command Create(CliContext ctx)
    {
        var c = new Command("compare", "Predicted against recorded read-outs per cell, per group and across cells (Pearson and Spearman r, mean absolute " +
            "error, bias).");
        // Per-cell models confronted with a cell's recording shrink its counts towards its group by default: a single
        // cell's zero count is often a dropout, and the unshrunk model would switch that channel off.
        var inputs = new ExpressionCommands.Inputs(defaultShrink: "group");
        inputs.AddTo(c);
        var recorded = new Option<string?>("--recorded")
        {
            Description = "Per-cell table of recorded values with units in the headers (default: the " +
            "--metadata table, unless --recordings is given)."
        };
        var recordings = new Option<string?>("--recordings")
        {
            Description = "Recorded current-clamp sweeps (an NWB file, a trace table or a directory of them): read-outs measured from them per cell. "
                + "With --recorded as well, a cell's value comes from its sweeps when they give one, else from the table.",
        };
        var cellColumn = new Option<string?>("--recorded-cell-column")
        {
            Description = "Cell id column of the recorded table (default: a column named like a " +
            "cell id)."
        };
        var map = new Option<string[]>("--map")
        {
            Description = "COLUMN=READOUT: compare this column with this read-out (COLUMN=none leaves it out; " +
            "repeatable)."
        };
        var per = new Option<string>("--per") { Description = "cell (each cell's own model) or group (its group's model).", DefaultValueFactory = _ => "cell" };
        var output = new Option<string?>("--out") { Description = "CSV file to write (default: standard output; the summary then goes to standard error)." };
        foreach (var o in new Option[] { recorded, recordings, cellColumn, map, per, output }) c.Options.Add(o);
        c.SetAction(p =>
        {
            var modelPer = p.GetValue(per) switch
            {
                "cell" => ModelPer.Cell,
                "group" => ModelPer.Group,
                var o => throw new CliException($"--per: '{o}' is not cell or group."),
            };
            string? sweepsPath = p.GetValue(recordings);
            string? recordedPath = p.GetValue(recorded) ?? (sweepsPath is null ? p.GetValue(inputs.Metadata) : null);
            if (recordedPath is null && sweepsPath is null)
                throw new CliException("Give the recorded values with --recorded FILE, --recordings PATH (sweeps) or a --metadata table that holds them.");
            if (recordedPath is null && p.GetValue(map) is { Length: > 0 }) throw new CliException("--map maps the columns of a recorded table; give the " +
                "table with --recorded FILE.");
            var shrinkMode = inputs.ShrinkMode(p);
            var (data, report, rule) = inputs.Load(p, ctx);
            var cells = data.Table.CellIds.ToHashSet(StringComparer.Ordinal);
            RecordedFeatures? fromTable = null, fromSweeps = null;
            if (recordedPath is not null)
                fromTable = ReadoutMatcher.Match(RecordedFeatureReader.Read(recordedPath, p.GetValue(cellColumn)), cells.Contains,
                    Overrides(p.GetValue(map) ?? []));
            if (sweepsPath is not null)
            {
                try
                {
                    fromSweeps = RecordedSweepFeatures.From(RecordingReader.Read(sweepsPath).Select(r => RecordingFeatures.Measure(r)).ToArray(),
                    Path.GetFileName(Path.TrimEndingDirectorySeparator(sweepsPath)), cells.Contains);
                }
                catch (RecordingFormatException e) { throw new CliException(e.Message); }
            }
            var features = fromSweeps is null ? fromTable! : fromTable is null ? fromSweeps : RecordedSweepFeatures.Join(fromSweeps, fromTable);
            foreach (var n in features.Notes) ctx.Error.WriteLine($"note: {n}");
            foreach (var m in features.Matches)
                ctx.Error.WriteLine(m.Matched ? $"match: '{m.Header}' -> {m.Readout}: {m.Reason}" : $"not compared: '{m.Header}': {m.Reason}");
            if (features.Readouts.Count == 0)
                throw new CliException($"{features.Source}: no column matched a read-out; name them like 'rheobase (pA)' or map them with --map " +
                    "COLUMN=READOUT.");
            if (features.RecordedCells.Count == 0) throw new CliException($"{features.Source}: no cell has a recorded value in a matched column.");
            ctx.Error.WriteLine($"recorded cells: {features.RecordedCells.Count}; models: " +
                $"{(modelPer == ModelPer.Cell ? "one per recorded cell" : "one per group")}");

            var progress = (ExpressionCommands.Progress?)null;
            var result = PredictedVersusRecorded.Run(data, report, rule, features, modelPer, shrinkMode, (done, total) =>
            {
                progress ??= new ExpressionCommands.Progress(ctx.Error, total);
                progress.Report(done);
            });
            progress?.Finish();
            if (result.ExpressionNote.Length > 0) ctx.Error.WriteLine($"note: {result.ExpressionNote}");
            var csv = ConfrontationTable.Create(result, ConfrontationTable.Comments(result, ResearchCaution.Text, data.Table.Source));
            string? path = p.GetValue(output);
            ctx.Emit(csv.ToString(), path);
            WriteSummary(string.IsNullOrEmpty(path) || path == "-" ? ctx.Error : ctx.Out, result);
            return 0;
        });
        return c;
    }

    private static Dictionary<string, string> Overrides(string[] maps)
    {
        var result = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var m in maps)
        {
            int eq = m.LastIndexOf('=');
            if (eq <= 0 || eq == m.Length - 1) throw new CliException($"--map '{m}': use COLUMN=READOUT or COLUMN=none.");
            result[m[..eq].Trim()] = m[(eq + 1)..].Trim();
        }
        return result;
    }

    private static void WriteSummary(TextWriter w, ConfrontationResult result)
    {
        w.WriteLine(ResearchCaution.Text);
        w.WriteLine($"{"readout",-22} {"unit",-8} {"n",4} {"pearson r",10} {"spearman r",11} {"MAE",10} {"bias",10}");
        foreach (var a in result.Agreement)
            w.WriteLine($"{a.Readout,-22} {a.Unit,-8} {a.Cells,4} {F(a.PearsonR),10} {F(a.SpearmanR),11} {F(a.MeanAbsoluteError),10} {F(a.Bias),10}");
    }

    private static string F(double? x) => x is { } v ? v.ToString("G3", CultureInfo.InvariantCulture) : "-";
}
