using System.CommandLine;
using System.Globalization;
using System.Text;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Core.Perturbation;

namespace ExprModel.Cli.Commands;

/// <summary>exprmodel knockdown | sensitivity | fit: why a model's read-outs are what they are, and which densities a recording asks for.</summary>
public static class WhatIfCommands
{
    private sealed class ModelSource
    {
        public readonly Argument<string?> Model = new("model") { Description = "Model file (exprmodel JSON).", Arity = ArgumentArity.ZeroOrOne };
        public readonly Option<string?> Preset = new("--preset")
        {
            Description = "Use a published preset instead of a file (hh1952, wb1996, cortex-rs2008, " +
            "cortex-fs2008)."
        };
        public readonly Option<string?> Out = new("--out") { Description = "Write to this file instead of standard output." };
        public readonly Option<string?> Db = new("--db") { Description = "Catalog database file." };

        public void AddTo(Command c)
        {
            c.Arguments.Add(Model);
            foreach (var o in new Option[] { Preset, Out, Db }) c.Options.Add(o);
        }

        public (ModelDocument Doc, ExprModel.Core.Cell.CellModel Cell) Load(ParseResult p, CliContext ctx)
        {
            ctx.DatabasePath = p.GetValue(Db);
            var file = p.GetValue(Model);
            var preset = p.GetValue(Preset);
            if ((file is null) == (preset is null)) throw new CliException("Give either a model file or --preset ID (exactly one).");
            if (file is not null && !File.Exists(file)) throw new CliException($"{file}: no such model file.");
            var doc = preset is not null ? ctx.Catalog.Preset(preset) : ModelDocument.Parse(File.ReadAllText(file!), file!);
            return (doc, ctx.Catalog.BuildCell(doc));
        }
    }

    public static IEnumerable<Command> Create(CliContext ctx)
    {
        yield return KnockdownCommand(ctx);
        yield return SensitivityCommand(ctx);
        yield return FitCommand(ctx);
    }

    private static string[] Caution(ModelDocument doc) => [ResearchCaution.Text, $"model: {doc.Name}"];

    private static Command KnockdownCommand(CliContext ctx)
    {
        var c = new Command("knockdown", "Each channel entry (or, with --genes, each gene of a model built from expression) reduced to --level: every " +
            "read-out's change, ranked.");
        var source = new ModelSource();
        source.AddTo(c);
        var level = new Option<double>("--level") { Description = "Fraction left: 0 = removed, 0.5 = half.", DefaultValueFactory = _ => 0 };
        var genes = new Option<bool>("--genes") { Description = "Knock down genes (the model's derivation) instead of channel entries." };
        var readout = new Option<string?>("--readout") { Description = "Only this read-out: which genes or entries set it, largest effect first." };
        var format = new Option<string>("--format") { Description = "csv or table.", DefaultValueFactory = _ => "table" };
        foreach (var o in new Option[] { level, genes, readout, format }) c.Options.Add(o);
        c.SetAction(p =>
        {
            var fmt = p.GetValue(format);
            if (fmt is not ("csv" or "table")) throw new CliException("--format must be csv or table.");
            var name = p.GetValue(readout);
            if (name is not null && ReadoutValues.UnitOf(name) is null) throw new CliException($"--readout: '{name}' is not a read-out (read-outs: " +
                $"{string.Join(", ", ReadoutValues.Names.Select(n => n.Name))}).");
            var (doc, cell) = source.Load(p, ctx);
            double lv = p.GetValue(level);
            var targets = p.GetValue(genes) ? GeneKnockdowns.Targets(doc, cell, lv)
                : KnockdownTarget.Channels(new DensityProbe(cell, Knockdown.DefaultSettings).ChannelLabels, lv);
            var report = Knockdown.Run(cell, targets, lv,
                progress: (done, all) => { if (done == all) ctx.Error.WriteLine($"knockdown: {all} variants measured"); });
            var rows = name is null ? report.AllRanked() : report.Ranked(name);
            var notes = Caution(doc).Concat([$"level {lv.ToString(CultureInfo.InvariantCulture)} of each " +
                $"{(p.GetValue(genes) ? "gene's expression" : "channel's density")}; read-outs with " +
                $"{ReadoutScales.Percent(Knockdown.DefaultSettings.RheobaseRelativeTolerance)} rheobase grid"])
                .Concat(report.Failures.Select(f => $"{f.Key}: {f.Value}")).ToArray();
            var header = new[] { "readout", "unit", "target", "kind", "intact", "knocked_down", "change", "relative_change", "lost" };
            // The table shows each value to its read-out's resolution (ReadoutDisplay); the CSV keeps full precision.
            object? Shown(double? v, string unit) => fmt == "csv" ? v : ReadoutDisplay.Format(v, unit);
            var cells = rows.Select(r => new object?[] { r.Readout, r.Unit, r.Target, r.Kind.ToString().ToLowerInvariant(), Shown(r.Intact, r.Unit),
                Shown(r.KnockedDown, r.Unit), Shown(r.Change, r.Unit), Shown(r.RelativeChange, "fraction"), r.Lost }).ToArray();
            ctx.Emit(fmt == "csv" ? Csv(notes, header, cells) : Table(notes, header, cells), p.GetValue(source.Out));
            return 0;
        });
        return c;
    }

    private static Command SensitivityCommand(CliContext ctx)
    {
        var c = new Command("sensitivity", "Sensitivity of every read-out to every channel density (central differences in ln density) as CSV: channels x " +
            "read-outs.");
        var source = new ModelSource();
        source.AddTo(c);
        var step = new Option<double>("--step-ln") { Description = "Step in ln(density) (default ln 1.2 = +-20 %).", DefaultValueFactory = _ => Math.Log(1.2) };
        c.Options.Add(step);
        c.SetAction(p =>
        {
            var (doc, cell) = source.Load(p, ctx);
            var m = Sensitivity.Run(cell, SensitivitySettings.Default with { StepLn = p.GetValue(step) });
            ctx.Emit(m.ToCsv(Caution(doc)), p.GetValue(source.Out));
            return 0;
        });
        return c;
    }

    private static Command FitCommand(CliContext ctx)
    {
        var c = new Command("fit", "Fits relative densities to recorded read-outs under an expression prior; prints the report and writes the fitted model " +
            "with --out.");
        var source = new ModelSource();
        source.AddTo(c);
        var target = new Option<string[]>("--target")
        {
            Description = "A recorded read-out, NAME=VALUE[UNIT] (repeat), e.g. rheobase=45pA.",
            AllowMultipleArgumentsPerToken = true
        };
        var file = new Option<string?>("--targets") { Description = "Targets table: CSV readout,value,unit[,scale]." };
        var width = new Option<double?>("--prior-width") { Description = "Prior width in ln(relative density) (default ln 2)." };
        var noPrior = new Option<bool>("--no-prior") { Description = "Fit without the expression prior." };
        var starts = new Option<int>("--starts") { Description = "Starting points (the model, then seeded random ones).", DefaultValueFactory = _ => 3 };
        var seed = new Option<int>("--seed") { Description = "Seed of the random starting points.", DefaultValueFactory = _ => 1 };
        var optimiser = new Option<string>("--optimiser")
        {
            Description = "lm (Levenberg-Marquardt, default) or simplex (Nelder-Mead).",
            DefaultValueFactory = _ => "lm"
        };
        var fix = new Option<string[]>("--fixed") { Description = "Channels held at their density (repeat).", AllowMultipleArgumentsPerToken = true };
        var recorded = new RecordedTargetOptions();
        foreach (var o in new Option[] { target, file, width, noPrior, starts, seed, optimiser, fix }) c.Options.Add(o);
        recorded.AddTo(c);
        c.SetAction(p =>
        {
            var typed = p.GetValue(target) ?? [];
            var path = p.GetValue(file);
            bool fromRecordings = recorded.Given(p);
            if ((typed.Length > 0 ? 1 : 0) + (path is null ? 0 : 1) + (fromRecordings ? 1 : 0) != 1)
                throw new CliException("Give the recorded read-outs one way: --target NAME=VALUE[UNIT] ..., --targets FILE, or --recorded FILE / " +
                    "--recordings PATH with --cell ID or --group G.");
            if (p.GetValue(noPrior) && p.GetValue(width) is not null) throw new CliException("--prior-width and --no-prior exclude each other.");
            if (path is not null && !File.Exists(path)) throw new CliException($"{path}: no such targets file.");
            var (doc, cell) = source.Load(p, ctx);
            var fromRecorded = fromRecordings ? recorded.Targets(p, cell.Geometry.AreaUm2) : null;
            foreach (var n in fromRecorded?.Notes ?? []) ctx.Error.WriteLine($"target: {n}");
            var targets = fromRecorded?.Targets ?? (path is not null ? FitTargetReader.ReadCsv(File.ReadAllText(path), path)
                : typed.Select(t => FitTargetReader.ParseTyped(t)).ToArray());
            var settings = FitSettings.Default with
            {
                // Read-outs from sweeps are measured on the recorded step; the model is measured on the same.
                Readouts = fromRecorded?.StepDurationMs is { } stepMs ? FitSettings.Default.Readouts with { StepDurationMs = stepMs }
                    : FitSettings.Default.Readouts,
                PriorWidth = p.GetValue(noPrior) ? null : p.GetValue(width) ?? FitSettings.Default.PriorWidth,
                Starts = p.GetValue(starts),
                Seed = p.GetValue(seed),
                Optimiser = p.GetValue(optimiser) switch
                {
                    "lm" => FitOptimiser.LevenbergMarquardt,
                    "simplex" => FitOptimiser.Simplex,
                    var o => throw new CliException($"--optimiser: '{o}' is not lm or simplex."),
                },
                FixedChannels = (p.GetValue(fix) ?? []).ToHashSet(StringComparer.Ordinal),
            };
            int lastDone = 0;
            var fit = DensityFit.Run(doc, cell, targets, settings, pr =>
            {
                if (Interlocked.Exchange(ref lastDone, pr.StartsDone) != pr.StartsDone)
                    ctx.Error.WriteLine($"fit: start {pr.StartsDone} of {pr.Starts} done, {pr.Evaluations} evaluations, best objective {pr.BestObjective:G4}");
            });
            var outPath = p.GetValue(source.Out);
            if (outPath is not null) ctx.Emit(fit.Document.ToJson() + "\n", outPath);
            ctx.Out.Write(FitText(doc, fit, outPath is null));
            return 0;
        });
        return c;
    }

    private static string FitText(ModelDocument doc, FitResult fit, bool noFile)
    {
        var sb = new StringBuilder();
        sb.AppendLine(Table([.. Caution(doc), fit.Summary],
            ["channel", "start_relative", "fitted_relative", "fold_change_from_expression", "pinned_by_data", "data_sd_ln", "at_bound"],
            fit.Channels.Select(ch => new object?[] { ch.Channel, ch.StartRelative, ch.FittedRelative, ch.FoldChange,
                ch.Fixed ? "fixed" : ch.Pinned ? "yes" : "no (free)", double.IsFinite(ch.DataSdLn) ? ch.DataSdLn : null, ch.AtBound }).ToArray()));
        sb.AppendLine(Table([], ["readout", "unit", "recorded", "scale", "before", "after", "scaled_residual_after"],
            fit.Residuals.Select(r => new object?[] { r.Readout, r.Unit, r.Recorded, r.Scale, r.Before, r.After, r.ScaledAfter }).ToArray()));
        sb.AppendLine(Table([$"singular values of the scaled sensitivity matrix (a direction is pinned " +
            $"when 1/s <= {fit.Settings.PinnedWithinLn:0.###} ln units)"],
            ["singular_value", "pinned", "direction"],
            fit.Identifiability.SingularValues.Select((v, k) => new object?[] { v, fit.Identifiability.DirectionPinned[k] ? "yes" : "no",
                fit.Identifiability.Directions[k] }).ToArray()));
        sb.AppendLine(FormattableString.Invariant($"objective {fit.ObjectiveBefore:G4} -> {fit.ObjectiveAfter:G4}; ") +
            FormattableString.Invariant($"{fit.Evaluations} evaluations; seed {fit.Settings.Seed}; ") +
            string.Join("; ", fit.Starts.Select(s => FormattableString.Invariant($"start {s.Index}: {s.Objective:G4} ({s.Exit})"))));
        if (noFile) sb.AppendLine("(give --out MODEL.json to save the fitted model)");
        return sb.ToString();
    }

    private static string Csv(IEnumerable<string> notes, string[] header, object?[][] rows)
    {
        var csv = new CsvTable(notes, header);
        foreach (var r in rows) csv.Row(r);
        return csv.ToString();
    }

    /// <summary>Aligned text columns for the terminal, numbers to four significant digits; notes first as '#' lines.</summary>
    private static string Table(IEnumerable<string> notes, string[] header, object?[][] rows)
    {
        string Cell(object? v) => v switch
        {
            null => "-",
            double d => d.ToString("G4", CultureInfo.InvariantCulture),
            bool b => b ? "yes" : "",
            _ => Convert.ToString(v, CultureInfo.InvariantCulture) ?? ""
        };
        var text = rows.Select(r => r.Select(Cell).ToArray()).Prepend(header).ToArray();
        var widths = header.Select((_, j) => text.Max(r => r[j].Length)).ToArray();
        var sb = new StringBuilder();
        foreach (var n in notes) sb.Append("# ").AppendLine(n);
        foreach (var r in text) sb.AppendLine(string.Join("  ", r.Select((v, j) => v.PadRight(widths[j]))).TrimEnd());
        return sb.ToString();
    }
}
