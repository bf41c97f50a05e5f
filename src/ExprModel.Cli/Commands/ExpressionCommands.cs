using System.CommandLine;
using System.Globalization;
using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;

namespace ExprModel.Cli.Commands;

/// <summary>exprmodel build | batch | merge: from an expression table to models and read-outs.</summary>
public static class ExpressionCommands
{
    internal sealed class Inputs(string defaultShrink = "none")
    {
        public readonly Option<string> Shrink = new("--shrink")
        {
            Description = "Per-cell models: none (each cell's own counts) or group (empirical-Bayes gamma-Poisson shrinkage towards the cell's group).",
            DefaultValueFactory = _ => defaultShrink,
        };
        public readonly Option<string> Expression =
            new("--expression") { Description = "Expression table: CSV/TSV (optionally .gz), Matrix Market directory or .mtx, or .h5ad.", Required = true };
        public readonly Option<string?> Metadata = new("--metadata") { Description = "Cell metadata table (cell id column plus group labels)." };
        public readonly Option<string?> GroupBy = new("--group-by") { Description = "Metadata column holding the group labels." };
        public readonly Option<string?> Unit = new("--unit")
        {
            Description = "Values are counts, cpm, tpm, fpkm (rpkm) or log-transformed (ln1p unless --log says otherwise) "
                + "(default: detected, with a note)."
        };
        public readonly Option<string?> Log = new("--log") { Description = "Values are log-transformed: ln1p, log2p1 or log10p1 (undone before use)." };
        public readonly Option<string?> Orientation = new("--orientation") { Description = "genes-as-rows or cells-as-rows (default: detected, with a note)." };
        public readonly Option<string?> Matrix = new("--matrix")
        {
            Description = ".h5ad only: the matrix to model: X (default), layer:NAME (a matrix under layers/) or raw (raw/X, genes from raw/var)."
        };
        public readonly Option<string?> ReferenceGroup =
            new("--reference-group") { Description = "Scale densities relative to this group's mean instead of the dataset median." };
        public readonly Option<double> Exponent =
            new("--exponent") { Description = "Exponent of the density rule (1 = linear).", DefaultValueFactory = _ => 1.0 };
        public readonly Option<bool> NoClamp = new("--no-clamp") { Description = "Do not clamp densities to each entry's plausible range." };
        public readonly Option<double> CapacitancePf =
            new("--capacitance") { Description = "Whole-cell capacitance of the model (pF).", DefaultValueFactory = _ => ModelDefaults.CapacitancePf };
        public readonly Option<double> Temperature =
            new("--temperature") { Description = "Model temperature (C).", DefaultValueFactory = _ => ModelDefaults.TemperatureC };
        public readonly Option<string[]> Exclude =
            new("--exclude") { Description = "Leave this gene out (repeatable).", AllowMultipleArgumentsPerToken = false };
        public readonly Option<string[]> Repoint = new("--repoint") { Description = "GENE=ENTRY[:WEIGHT]: feed this gene to another entry only (repeatable)." };
        public readonly Option<string[]> Weight = new("--weight") { Description = "GENE=WEIGHT: change the weight of a gene's links (repeatable)." };
        public readonly Option<string?> Db = new("--db") { Description = "Catalog database file." };

        public void AddTo(Command c)
        {
            foreach (var o in new Option[] { Expression, Metadata, GroupBy, Unit, Log, Orientation, Matrix, ReferenceGroup, Exponent, NoClamp, CapacitancePf,
                Temperature, Exclude, Repoint, Weight, Shrink, Db })
                c.Options.Add(o);
        }

        /// <summary>The read options the user stated (orientation, unit, log transform, matrix).</summary>
        public ExpressionReadOptions ReadOptions(ParseResult p) =>
            ReadOptionsParser.Parse(p.GetValue(Orientation), p.GetValue(Unit), p.GetValue(Log), "--", p.GetValue(Matrix));

        /// <summary>The settings dataset references depend on, in words (a shard refuses references made with others).</summary>
        public string ReferenceSettings(ParseResult p) => string.Join("; ",
            $"orientation={p.GetValue(Orientation)}", $"unit={p.GetValue(Unit)}", $"log={p.GetValue(Log)}", $"matrix={p.GetValue(Matrix)}",
            $"reference={p.GetValue(ReferenceGroup) ?? "dataset median"}", $"group-by={p.GetValue(GroupBy)}",
            $"exclude={string.Join(",", p.GetValue(Exclude) ?? [])}", $"repoint={string.Join(",", p.GetValue(Repoint) ?? [])}",
            $"weight={string.Join(",", p.GetValue(Weight) ?? [])}", $"shrink={p.GetValue(Shrink)}");

        /// <summary>Reads, groups and maps the inputs with the library's <see cref="ExpressionDataset"/>; notes go to standard error.</summary>
        /// <param name="adjust">Changes the stated read options (a shard's cell range and the dataset's unit).</param>
        public (ExpressionDataset Data, MappingReport Report, DensityRule Rule) Load(ParseResult p, CliContext ctx,
            Func<ExpressionReadOptions, ExpressionReadOptions>? adjust = null)
        {
            ctx.DatabasePath = p.GetValue(Db);
            var catalog = ctx.Catalog.ForMapping();
            var options = ReadOptions(p);
            if (adjust is not null) options = adjust(options);
            string? metadata = p.GetValue(Metadata), column = p.GetValue(GroupBy);
            if (metadata is not null && column is null) throw new CliException("--metadata needs --group-by COLUMN.");
            if (metadata is null && column is not null) throw new CliException("--group-by needs --metadata FILE.");
            var data = ExpressionDataset.Read(catalog, p.GetValue(Expression)!, options, metadata, column);
            foreach (var n in data.Notes) ctx.Error.WriteLine($"note: {n}");
            var report = data.Map(Overrides(p));
            var rule = DensityRule.RelativeTo(p.GetValue(ReferenceGroup)) with
            {
                Exponent = p.GetValue(Exponent),
                ClampToPlausibleRange = !p.GetValue(NoClamp),
                CapacitancePf = p.GetValue(CapacitancePf),
                TemperatureC = p.GetValue(Temperature),
            };
            return (data, report, rule);
        }

        public ShrinkageMode ShrinkMode(ParseResult p) => p.GetValue(Shrink) switch
        {
            "none" => ShrinkageMode.None,
            "group" => ShrinkageMode.Group,
            var o => throw new CliException($"--shrink: '{o}' is not none or group."),
        };

        /// <summary>The per-cell estimates the --shrink option asks for (null for none); its note goes to standard error.</summary>
        /// <param name="references">Dataset references holding the priors fitted over the whole table (a shard), and their file.</param>
        public PerCellShrinkage? Shrinkage(ParseResult p, CliContext ctx, ExpressionDataset data, MappingReport report,
            (DatasetReferences Refs, string Path)? references = null)
        {
            if (ShrinkMode(p) == ShrinkageMode.None) return null;
            PerCellShrinkage s;
            if (references is var (refs, path))
            {
                if (refs.Shrinkage is null) throw new CliException($"{path}: holds no shrinkage priors (written without --shrink group); write them again.");
                try { s = data.Shrink(report, refs.Shrinkage); }
                catch (ArgumentException e) { throw new CliException($"{path}: {e.Message} Write them again for this run."); }
            }
            else s = data.Shrink(report);
            ctx.Error.WriteLine($"note: {s.Note}");
            return s;
        }

        private List<GeneOverride> Overrides(ParseResult p)
        {
            var list = new List<GeneOverride>();
            foreach (var g in p.GetValue(Exclude) ?? []) list.Add(new GeneOverride(g, Exclude: true));
            foreach (var r in p.GetValue(Repoint) ?? [])
            {
                var parts = r.Split('=', 2);
                if (parts.Length != 2) throw new CliException($"--repoint '{r}': use GENE=ENTRY or GENE=ENTRY:WEIGHT.");
                var target = parts[1].Split(':', 2);
                double? w = target.Length == 2 ? ParseNumber(target[1], "--repoint weight") : null;
                list.Add(new GeneOverride(parts[0], EntryId: target[0], Weight: w));
            }
            foreach (var r in p.GetValue(Weight) ?? [])
            {
                var parts = r.Split('=', 2);
                if (parts.Length != 2) throw new CliException($"--weight '{r}': use GENE=WEIGHT.");
                list.Add(new GeneOverride(parts[0], Weight: ParseNumber(parts[1], "--weight")));
            }
            return list;
        }
    }

    private static double ParseNumber(string s, string what) =>
        double.TryParse(s, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) && double.IsFinite(v) ? v
            : throw new CliException($"{what}: '{s}' is not a number.");

    public static IEnumerable<Command> Create(CliContext ctx)
    {
        yield return Build(ctx);
        yield return Batch(ctx);
        yield return Merge(ctx);
    }

    private static void PrintReport(CliContext ctx, ExpressionDataset data, MappingReport report)
    {
        var (w, table, groups) = (ctx.Error, data.Table, data.Groups);
        w.WriteLine($"table: {table.Source}: {table.CellIds.Count} cells, {table.TotalGeneCount} genes; {table.OrientationNote}; unit: " +
            $"{table.Unit} ({table.UnitNote})");
        foreach (var n in table.Notes) w.WriteLine($"note: {n}");
        if (groups is not null) w.WriteLine($"groups ({groups.Column}): {string.Join(", ", groups.Members.Select(g => $"{g.Key} ({g.Value.Length})"))}");
        w.WriteLine($"mapped channel genes: {report.Genes.Count(g => !g.Excluded)} -> {report.EntryExpression().Count} entries");
        foreach (var g in report.Genes)
        {
            w.WriteLine($"  {g.Symbol,-10} {string.Join(", ", g.Entries.Select(e => $"{e.EntryId} x{e.Weight:G3}{(e.IsProxy ? " (proxy)" : "")}")),-40} mean " +
                $"{g.ExpressionByCell.Average():G4}{(g.How == "symbol" ? "" : " [" + g.How + "]")}{(g.Note is null ? "" : " (" + g.Note + ")")}");
            if (groups is not null)
                w.WriteLine("             " + string.Join("; ", groups.Members.Select(m => CellGroups.Statistic(m.Key, m.Value, g.ExpressionByCell))
                    .Select(st => $"{st.Group} {st.Mean:G3}+-{st.StandardDeviation:G2} ({st.FractionExpressing:P0} >0)")));
        }
        foreach (var pl in report.Proxies) w.WriteLine($"proxy: {pl.Symbol} -> {pl.EntryId}: {pl.Reason}");
        if (report.Unmapped.Count > 0)
            w.WriteLine($"channel genes not mapped: {string.Join("; ", report.Unmapped.Select(u => $"{u.Symbol} ({u.Status}: {u.Reason})"))}");
        if (report.EntriesWithoutExpressedGene.Count > 0)
            w.WriteLine($"entries with no expressed gene: {string.Join(", ", report.EntriesWithoutExpressedGene)}");
        foreach (var pr in report.Problems) w.WriteLine($"problem: {pr}");
    }

    private static Command Build(CliContext ctx)
    {
        var c = new Command("build", "Build a model for one group or one cell from an expression table; prints the mapping report.");
        var inputs = new Inputs();
        inputs.AddTo(c);
        var group = new Option<string?>("--group") { Description = "Model this group (mean of its cells)." };
        var cell = new Option<string?>("--cell") { Description = "Model this cell." };
        var output = new Option<string?>("--out") { Description = "Model file to write (default: standard output)." };
        c.Options.Add(group);
        c.Options.Add(cell);
        c.Options.Add(output);
        c.SetAction(p =>
        {
            if ((p.GetValue(group) is null) == (p.GetValue(cell) is null)) throw new CliException("Give exactly one of --group NAME or --cell ID.");
            var (data, report, rule) = inputs.Load(p, ctx);
            PrintReport(ctx, data, report);
            var target = p.GetValue(group) is { } g ? ModelTarget.ForGroup(g) : ModelTarget.ForCell(p.GetValue(cell)!);
            var built = data.Build(report, rule, target, target.CellId is null ? null : inputs.Shrinkage(p, ctx, data, report));
            foreach (var d in built.Densities)
                ctx.Error.WriteLine($"density {d.EntryId,-20} {rule.Formula(d)}");
            foreach (var wn in built.Warnings) ctx.Error.WriteLine($"warning: {wn}");
            var doc = built.Document with { Caution = ResearchCaution.Text };
            ctx.Emit(doc.ToJson() + "\n", p.GetValue(output));
            return 0;
        });
        return c;
    }

    private static Command Batch(CliContext ctx)
    {
        var c = new Command("batch", "Read-outs for every group (or every cell): one CSV row each, with a progress bar.");
        var inputs = new Inputs();
        inputs.AddTo(c);
        var per = new Option<string>("--per") { Description = "group or cell.", DefaultValueFactory = _ => "group" };
        var shard = new Option<string?>("--shard") { Description = "I/N: process only the I-th of N equal parts (join with exprmodel merge)." };
        var output = new Option<string?>("--out") { Description = "CSV file to write (default: standard output)." };
        var writeReferences = new Option<string?>("--write-references")
        {
            Description = "Read the whole table once, write the dataset references (unit, each entry's reference expression) to this file and stop.",
        };
        var references = new Option<string?>("--references")
        {
            Description = "Dataset references from --write-references (same table and options): with --per cell each shard then reads only its own cells.",
        };
        c.Options.Add(per);
        c.Options.Add(shard);
        c.Options.Add(output);
        c.Options.Add(writeReferences);
        c.Options.Add(references);
        c.SetAction(p =>
        {
            var (index, count) = ParseShard(p.GetValue(shard));
            if (p.GetValue(writeReferences) is { } referencesOut)
            {
                var (all, allReport, allRule) = inputs.Load(p, ctx);
                // With shrinkage the per-cell models divide shrunk values by references over shrunk values: store both.
                var fitted = inputs.Shrinkage(p, ctx, all, allReport);
                var computed = DatasetReferences.Compute(all, fitted?.Report ?? allReport, allRule, inputs.ReferenceSettings(p)) with
                {
                    Shrinkage = fitted?.Priors,
                };
                ctx.Emit(computed.ToJson(), referencesOut);
                ctx.Error.WriteLine($"dataset references of {computed.Cells} cells ({computed.Entries.Count} entries, unit {computed.Unit}" +
                    (fitted is null ? "" : $", shrinkage priors of {fitted.Priors.GeneCount} genes") + $") written to {referencesOut}");
                return 0;
            }
            var (refs, range, total) = ShardRange(p, ctx, inputs, p.GetValue(references), p.GetValue(per), index, count);
            var (data, report, rule) = inputs.Load(p, ctx, range is { } r ? o => o with { Cells = r, Unit = refs!.Unit } : null);
            if (refs is not null) rule = rule with { FixedReferences = refs.Entries };
            PrintReport(ctx, data, report);
            var (table, groups) = (data.Table, data.Groups);
            IReadOnlyList<ModelTarget> items = range is { } part ? new RangeTargets(table.CellIds, part, total) : p.GetValue(per) switch
            {
                "group" => groups is null ? throw new CliException("--per group needs --metadata and --group-by.") : data.Targets,
                "cell" => data.CellTargets,
                var o => throw new CliException($"--per: '{o}' is not group or cell."),
            };
            int from = range?.Start ?? (int)((long)items.Count * (index - 1) / count), to = range?.End ?? (int)((long)items.Count * index / count);
            var progress = new Progress(ctx.Error, to - from);
            var shrink = p.GetValue(per) == "cell" ? inputs.Shrinkage(p, ctx, data, report, refs is null ? null : (refs, p.GetValue(references)!)) : null;
            var results = BatchReadouts.Run(table, report, data.Catalog, rule, items, groups, from, to, progress.Report, default, shrink);
            progress.Finish();
            var csv = BatchTable.Create(results,
                [ResearchCaution.Text, $"source: {table.Source}; shard {index}/{count} of {items.Count} items{(shrink is null ? "" : "; " + shrink.Note)}"]);
            ctx.Emit(csv.ToString(), p.GetValue(output));
            return 0;
        });
        return c;
    }

    /// <summary>
    /// With dataset references, a per-cell shard reads only its own cells: the table's cell count is read first
    /// (obs index shape, cell sidecar, header or an unparsed pass), then the shard's range. Without references the
    /// whole table is read, as the dataset median (and, with --shrink group, each group's priors) needs every cell.
    /// </summary>
    private static (DatasetReferences? Refs, CellRange? Range, int Total) ShardRange(ParseResult p, CliContext ctx, Inputs inputs, string? path,
        string? per, int index, int count)
    {
        if (path is null)
        {
            if (count > 1 && per == "cell")
                ctx.Error.WriteLine("note: this shard reads every cell, because the dataset references need them all; write them once with " +
                    "--write-references FILE and pass --references FILE so each shard reads only its own cells.");
            return (null, null, 0);
        }
        if (per != "cell") throw new CliException("--references: only with --per cell (a group's model needs all its cells).");
        if (!File.Exists(path)) throw new CliException($"{path}: no such references file.");
        DatasetReferences refs;
        try { refs = DatasetReferences.Read(path); }
        catch (FormatException e) { throw new CliException(e.Message); }
        string table = p.GetValue(inputs.Expression)!;
        int total = ExpressionReader.CountCells(table, inputs.ReadOptions(p));
        if (refs.Mismatch(table, total, inputs.ReferenceSettings(p)) is { } why) throw new CliException($"{path}: {why}; write them again for this run.");
        return (refs, CellRange.Part(index, count, total), total);
    }

    /// <summary>The per-cell targets of a whole table of which only <paramref name="range"/>'s cells were read (indices stay the table's).</summary>
    private sealed class RangeTargets(IReadOnlyList<string> cellIds, CellRange range, int total) : IReadOnlyList<ModelTarget>
    {
        public int Count => total;

        public ModelTarget this[int index] => range.Contains(index) ? ModelTarget.ForCell(cellIds[index - range.Start])
            : throw new ArgumentOutOfRangeException(nameof(index), $"cell {index} lies outside this shard's {range}.");

        public IEnumerator<ModelTarget> GetEnumerator() => Enumerable.Range(range.Start, range.Count).Select(i => this[i]).GetEnumerator();
        System.Collections.IEnumerator System.Collections.IEnumerable.GetEnumerator() => GetEnumerator();
    }

    internal static (int Index, int Count) ParseShard(string? text)
    {
        if (text is null) return (1, 1);
        var parts = text.Split('/');
        if (parts.Length == 2 && int.TryParse(parts[0], out var i) && int.TryParse(parts[1], out var n) && n >= 1 && i >= 1 && i <= n) return (i, n);
        throw new CliException($"--shard '{text}': use I/N with 1 <= I <= N, e.g. 2/8.");
    }

    private static Command Merge(CliContext ctx)
    {
        var c = new Command("merge", "Join batch shards into the table one unsharded run writes (refuses cut-off files, names missing shards).");
        var files = new Argument<string[]>("shards") { Description = "Shard CSV files written by exprmodel batch --shard.", Arity = ArgumentArity.OneOrMore };
        var output = new Option<string?>("--out") { Description = "CSV file to write (default: standard output)." };
        c.Arguments.Add(files);
        c.Options.Add(output);
        c.SetAction(p =>
        {
            ShardMerge.Merge(p.GetValue(files)!, ctx, p.GetValue(output));
            return 0;
        });
        return c;
    }

    /// <summary>A progress bar on standard error (a line per 10 % when it is not a terminal).</summary>
    internal sealed class Progress(TextWriter w, int total)
    {
        private readonly Lock _gate = new();
        private int _lastDecile = -1;

        public void Report(int done)
        {
            lock (_gate)
            {
                if (total == 0) return;
                if (Console.IsErrorRedirected || w != Console.Error)
                {
                    int decile = done * 10 / total;
                    if (decile != _lastDecile) { _lastDecile = decile; w.WriteLine($"progress: {done}/{total}"); }
                    return;
                }
                int width = 30, fill = done * width / total;
                w.Write($"\r[{new string('#', fill)}{new string('.', width - fill)}] {done}/{total}");
            }
        }

        public void Finish()
        {
            if (!Console.IsErrorRedirected && w == Console.Error) w.WriteLine();
        }
    }
}
