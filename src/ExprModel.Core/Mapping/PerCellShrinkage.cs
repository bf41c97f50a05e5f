using System.Globalization;
using System.Text.Json.Nodes;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Shrinkage;

namespace ExprModel.Core.Mapping;

/// <summary>
/// Per-cell expression that borrows strength from the cell's group: every mapped gene's CPM in every cell replaced by its
/// empirical-Bayes gamma-Poisson posterior mean (<see cref="GammaPoissonShrinkage"/>), with one prior per gene and group
/// (cells without a group, or a table without groups, share one prior over the whole table). A single cell's zero count
/// is then read as "low, as far as this library can tell", not as "absent". Group models are built from the raw values as
/// before; per-cell models are built from the shrunk ones, so their reference (the dataset median or a reference group's
/// mean) is taken over shrunk values too, and each model's derivation carries both the raw and the shrunk values.
/// Needs raw counts: for TPM, FPKM or CPM tables it does nothing and says so in <see cref="Note"/>.
/// The priors are fitted over every cell of the table, or, for a part of an atlas, taken from those a full read fitted
/// (<see cref="FromPriors"/>, stored in <see cref="DatasetReferences"/>): a cell's estimate needs only its prior, its own
/// counts and its library size, so both ways give the same numbers.
/// </summary>
public sealed class PerCellShrinkage
{
    private readonly ExpressionTable _table;
    private readonly MappingReport _raw;
    private readonly MappingReport? _shrunk;
    private readonly Dictionary<string, GammaPoissonPrior[]> _priorByGeneAndCell = new(StringComparer.Ordinal);
    private readonly string[] _priorGroup;

    /// <summary>False when the table holds no raw counts (nothing is shrunk).</summary>
    public bool Applies => _shrunk is not null;

    /// <summary>What was done, for the user: the method and what the priors were taken over, or why nothing was shrunk.</summary>
    public string Note { get; }

    /// <summary>The mapping with every gene's per-cell values replaced by the shrunk estimates (the raw mapping when nothing applies).</summary>
    public MappingReport Report => _shrunk ?? _raw;

    /// <summary>The fitted priors by gene and prior set (empty when nothing applies), to store for parts of the table.</summary>
    public ShrinkagePriors Priors { get; } = new();

    /// <summary>Fits every mapped gene's prior over each of <paramref name="groups"/> (and the cells without a group) of the table.</summary>
    public PerCellShrinkage(ExpressionTable table, MappingReport report, CellGroups? groups)
        : this(table, report, groups, stored: null)
    {
    }

    /// <summary>
    /// Shrinks the cells of <paramref name="table"/> (typically a part of an atlas read by cell range) with priors fitted
    /// earlier over the whole table, looked up by gene and by each cell's prior set (its group, as named in the part).
    /// </summary>
    /// <exception cref="ArgumentException">A mapped gene or a cell's prior set has no stored prior (names which).</exception>
    public static PerCellShrinkage FromPriors(ExpressionTable table, MappingReport report, CellGroups? groups, ShrinkagePriors priors) =>
        new(table, report, groups, priors);

    private PerCellShrinkage(ExpressionTable table, MappingReport report, CellGroups? groups, ShrinkagePriors? stored)
    {
        _table = table;
        _raw = report;
        _priorGroup = new string[table.CellIds.Count];
        if (table.Unit != ExpressionUnit.Counts)
        {
            Note = $"per-cell expression not shrunk: the table holds {table.Unit}, and the gamma-Poisson estimate needs raw counts and library sizes.";
            return;
        }
        var sets = new List<(string Name, int[] Members)>();
        var grouped = new HashSet<int>();
        if (groups is not null)
            foreach (var (name, members) in groups.Members)
            {
                sets.Add(("group " + name, members));
                grouped.UnionWith(members);
            }
        var rest = Enumerable.Range(0, table.CellIds.Count).Where(i => !grouped.Contains(i)).ToArray();
        if (rest.Length > 0) sets.Add((groups is null ? "every cell of the table" : "the cells without a group", rest));
        foreach (var (name, members) in sets)
            foreach (int i in members) _priorGroup[i] = name;

        var genes = new List<GeneMapping>();
        foreach (var g in report.Genes)
        {
            var counts = table.Genes[g.TableId];
            var priors = new GammaPoissonPrior[counts.Length];
            var shrunk = new double[counts.Length];
            foreach (var (name, members) in sets)
            {
                var prior = stored?.Of(g.TableId, name) ?? GammaPoissonShrinkage.EstimatePrior(counts, table.LibrarySizes, members);
                Priors.Add(g.TableId, name, prior);
                foreach (int i in members)
                {
                    priors[i] = prior;
                    shrunk[i] = prior.PosteriorMeanCpm(counts[i], table.LibrarySizes[i]);
                }
            }
            _priorByGeneAndCell[g.TableId] = priors;
            genes.Add(g with { ExpressionByCell = shrunk });
        }
        _shrunk = new MappingReport
        {
            Source = report.Source,
            Genes = genes,
            Unmapped = report.Unmapped,
            EntriesWithoutExpressedGene = report.EntriesWithoutExpressedGene,
            Problems = report.Problems,
            Species = report.Species,
            Overrides = report.Overrides,
            CellCount = report.CellCount,
        };
        Note = "per-cell expression shrunk towards each cell's " + (groups is null ? "dataset" : "group")
            + " (empirical-Bayes gamma-Poisson, method-of-moments prior per gene and group; Marshall 1991).";
    }

    /// <summary>
    /// Builds a model like <see cref="ExpressionModelBuilder.Build"/>: a cell's model from the shrunk expression, with the raw
    /// and shrunk values of every gene in its derivation (section "expressionEstimate") and a warning for each channel whose
    /// genes all read zero in the cell yet get a density from the shrunk estimate; a group's model from the raw expression.
    /// </summary>
    public BuiltModel Build(MappingCatalog catalog, DensityRule rule, ModelTarget target, CellGroups? groups)
    {
        if (!Applies || target.CellId is null) return ExpressionModelBuilder.Build(_table, _raw, catalog, rule, target, groups);
        var built = ExpressionModelBuilder.Build(_table, Report, catalog, rule, target, groups);
        int cell = Enumerable.Range(0, _table.CellIds.Count).First(i => _table.CellIds[i] == target.CellId);
        return Annotate(built, cell);
    }

    private BuiltModel Annotate(BuiltModel built, int cell)
    {
        var rawGenes = _raw.Genes.ToDictionary(g => g.Symbol, StringComparer.Ordinal);
        var shrunkGenes = Report.Genes.ToDictionary(g => g.Symbol, StringComparer.Ordinal);
        double library = _table.LibrarySizes[cell];
        var warnings = built.Warnings.ToList();
        var densities = new JsonArray();
        foreach (var d in built.Densities)
        {
            var genes = new JsonArray();
            double rawExpression = 0, shrunkExpression = 0;
            bool allZero = true;
            foreach (var c in d.Genes)
            {
                var raw = rawGenes[c.Gene];
                var prior = _priorByGeneAndCell[raw.TableId][cell];
                double count = _table.Genes[raw.TableId][cell];
                rawExpression += c.Weight * raw.ExpressionByCell[cell];
                shrunkExpression += c.Weight * shrunkGenes[c.Gene].ExpressionByCell[cell];
                if (c.Weight > 0 && count > 0) allZero = false;
                genes.Add(new JsonObject
                {
                    ["gene"] = c.Gene,
                    ["weight"] = c.Weight,
                    ["counts"] = count,
                    ["rawCpm"] = raw.ExpressionByCell[cell],
                    ["shrunkCpm"] = shrunkGenes[c.Gene].ExpressionByCell[cell],
                    ["priorMeanCpm"] = prior.MeanCpm,
                    ["priorShape"] = double.IsFinite(prior.Shape) ? prior.Shape : null,
                    ["priorCells"] = prior.Cells,
                });
            }
            string? note = null;
            if (allZero && d.Genes.Count > 0 && d.DensityMsPerCm2 > 0)
            {
                note = $"{d.EntryId}: {string.Join(", ", d.Genes.Select(g => g.Gene))} read 0 counts in cell {_table.CellIds[cell]} "
                    + $"(library {F(library)} counts); its density {F(d.DensityMsPerCm2)} mS/cm2 comes from the shrunk estimate {F(shrunkExpression)} "
                    + $"(prior over {_priorGroup[cell]}), not from a measured level in this cell.";
                warnings.Add(note);
            }
            densities.Add(new JsonObject
            {
                ["entry"] = d.EntryId,
                ["rawExpression"] = rawExpression,
                ["shrunkExpression"] = shrunkExpression,
                ["densityMsPerCm2"] = d.DensityMsPerCm2,
                ["fromZeroCounts"] = note is not null,
                ["genes"] = genes,
            });
        }
        var derivation = built.Document.Derivation?.DeepClone().AsObject() ?? [];
        derivation["expressionEstimate"] = new JsonObject
        {
            ["method"] = "empirical-Bayes gamma-Poisson shrinkage: CPM = (counts + a) / (library / 1e6 + b), prior (a, b) per gene by the method "
                + "of moments over the cell's group (Marshall 1991, Applied Statistics 40:283)",
            ["priorOver"] = _priorGroup[cell],
            ["libraryCounts"] = library,
            ["densities"] = densities,
        };
        if (derivation["warnings"] is JsonArray w)
            foreach (var n in warnings.Skip(built.Warnings.Count)) w.Add(n);
        return built with { Document = built.Document with { Derivation = derivation }, Warnings = warnings };
    }

    private static string F(double x) => x.ToString("G4", CultureInfo.InvariantCulture);
}
