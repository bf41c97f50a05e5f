using System.CommandLine;
using System.Globalization;
using ExprModel.Core.Export;
using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Kinetics;
using ExprModel.Data.Catalog;

namespace ExprModel.Cli.Commands;

/// <summary>exprmodel catalog list|show|build.</summary>
public static class CatalogCommands
{
    public static Command Create(CliContext ctx)
    {
        var catalog = new Command("catalog", "Browse and build the channel-kinetics catalog.");
        var db = new Option<string?>("--db") { Description = "Catalog database file (default: per-user cache; built when missing or stale)." };

        var list = new Command("list", "List the catalog's entries (latest versions).");
        var format = new Option<string>("--format") { Description = "table or csv", DefaultValueFactory = _ => "table" };
        list.Options.Add(db);
        list.Options.Add(format);
        list.SetAction(p =>
        {
            ctx.DatabasePath = p.GetValue(db);
            var entries = ctx.Catalog.Latest;
            if (p.GetValue(format) == "csv")
            {
                var t = new CsvTable([], ["id", "version", "family", "ion", "name", "temperature_c", "typical_density_ms_per_cm2", "source", "verification"]);
                foreach (var e in entries)
                    t.Row(e.Id, e.Version, e.Family, Word(e.Ion), e.Name, e.ReferenceTemperatureC, e.TypicalDensityMsPerCm2, e.Source.Short,
                        Word(e.Source.Verification));
                ctx.Out.Write(t.ToString());
                return 0;
            }
            ctx.Out.WriteLine($"{"id",-24} {"ver",3} {"family",-15} {"ion",-11} {"density",8}  source");
            foreach (var e in entries)
                ctx.Out.WriteLine($"{e.Id,-24} {e.Version,3} {e.Family,-15} {Word(e.Ion),-11} {e.TypicalDensityMsPerCm2,8:G4}  " +
                    $"{e.Source.Authors.Split(',')[0]} {e.Source.Year} ({Word(e.Source.Verification)})");
            var presets = string.Join(", ", ctx.Catalog.Presets.Keys.Order(StringComparer.Ordinal));
            ctx.Out.WriteLine($"{entries.Count} entries (density: typical, mS/cm2); presets: {presets}");
            return 0;
        });

        var show = new Command("show", "Show one entry: kinetics, citation, genes.");
        var id = new Argument<string>("id") { Description = "Entry id, optionally id@version." };
        show.Arguments.Add(id);
        show.Options.Add(db);
        show.SetAction(p =>
        {
            ctx.DatabasePath = p.GetValue(db);
            var text = p.GetValue(id)!;
            int? version = null;
            if (text.Contains('@'))
            {
                var parts = text.Split('@');
                text = parts[0];
                version =
                    int.TryParse(parts[1], CultureInfo.InvariantCulture, out var v) ? v : throw new CliException($"'{parts[1]}' is not a version number.");
            }
            var e = ctx.Catalog.Resolve(text, version);
            ctx.Out.Write(EntryFile.Write(e));
            ctx.Out.WriteLine();
            var genes = ctx.Catalog.GeneLinks.Where(l => l.EntryId == e.Id)
                .Select(l => $"{l.Symbol} ({Word(l.Species)}, weight {l.Weight:G3}{(l.IsProxy ? ", proxy: " + l.Reason : "")})").ToArray();
            ctx.Out.WriteLine($"genes: {(genes.Length == 0 ? "(none linked)" : string.Join(", ", genes))}");
            ctx.Out.WriteLine("citation: " + CatalogReport.CitationStatus(e.Source));
            ctx.Out.WriteLine("parameters: " + CatalogReport.ParameterStatus(e.Source));
            return 0;
        });

        var build = new Command("build", "Build the catalog database from its source files now.");
        var from = new Option<string?>("--from") { Description = "Catalog source directory (default: the checkout's catalog/, else the embedded copy)." };
        build.Options.Add(db);
        build.Options.Add(from);
        build.SetAction(p =>
        {
            var path = p.GetValue(db) ?? CatalogLocator.DefaultDatabasePath();
            var sources = p.GetValue(from) is { } dir ? CatalogSources.FromDirectory(dir) : CatalogLocator.DefaultSources();
            var content = CatalogBuilder.Build(sources, path);
            ctx.Out.WriteLine($"built {path}: {content.Entries.Count} entry versions, {content.GeneLinks.Count} gene links, {content.Presets.Count} presets, " +
                $"from {sources.Origin}");
            return 0;
        });

        var genes = new Command("genes", "Every channel gene the catalog knows: species, status (linked, auxiliary, non-neuronal, not-modelled) and entries.");
        var genesFormat = new Option<string>("--format") { Description = "csv or table", DefaultValueFactory = _ => "table" };
        genes.Options.Add(db);
        genes.Options.Add(genesFormat);
        genes.SetAction(p =>
        {
            ctx.DatabasePath = p.GetValue(db);
            var rows = GeneCoverage.Rows(ctx.Catalog);
            if (p.GetValue(genesFormat) == "csv")
            {
                ctx.Out.Write(GeneCoverage.ToCsv(rows));
                return 0;
            }
            foreach (var r in rows) ctx.Out.WriteLine($"{r.Symbol,-10} {Word(r.Species),-6} {r.Status,-13} {string.Join(" ", r.Entries)}");
            var v = GeneCoverage.VoltageGatedPoreCoverage(ctx.Catalog);
            string unlinked = v.Unlinked.Count == 0 ? "none unlinked" : $"unlinked: {string.Join(", ", v.Unlinked)}";
            string proxyOnly = v.ProxyOnly.Count > 0 ? $" (through a proxy only: {string.Join(", ", v.ProxyOnly)})" : "";
            ctx.Out.WriteLine($"{rows.Count} rows; {v.Group} linked to kinetics of their own family: {v.Linked} of {v.Total} ({v.Fraction:P0}); " +
                $"{unlinked}{proxyOnly}");
            return 0;
        });

        var report = new Command("report", "A reviewer's report: every entry's citation, status, half-activations, time constants and curve table.");
        var all = new Option<bool>("--all-versions") { Description = "Include superseded versions." };
        var reportOut = new Option<string?>("--out") { Description = "Write the report (Markdown) to this file." };
        report.Options.Add(db);
        report.Options.Add(all);
        report.Options.Add(reportOut);
        report.SetAction(p =>
        {
            ctx.DatabasePath = p.GetValue(db);
            ctx.Emit(CatalogReport.Markdown(ctx.Catalog, p.GetValue(all)), p.GetValue(reportOut));
            return 0;
        });

        catalog.Subcommands.Add(list);
        catalog.Subcommands.Add(genes);
        catalog.Subcommands.Add(report);
        catalog.Subcommands.Add(show);
        catalog.Subcommands.Add(build);
        return catalog;
    }

    internal static string Word<T>(T value) where T : struct, Enum => CatalogBuilder.Word(value);
}
