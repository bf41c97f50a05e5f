using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Expression;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Mapping;

/// <summary>What the mapping needs from the catalog: latest entries, gene links, statuses and identifiers.</summary>
public sealed record MappingCatalog(IReadOnlyList<ChannelEntry> Entries, IReadOnlyList<GeneLink> Links, IReadOnlyList<GeneStatus> Statuses, IReadOnlyList<GeneIdentifier> Identifiers)
{
    public ChannelEntry? Entry(string id) => Entries.FirstOrDefault(e => e.Id == id);
}

/// <summary>A gene of the table feeding one entry with a weight.</summary>
public sealed record EntryWeight(string EntryId, double Weight);

/// <summary>A channel gene of the table linked to catalog entries, with its normalised expression per cell.</summary>
public sealed record GeneMapping(string TableId, string Symbol, Species Species, string How, IReadOnlyList<EntryWeight> Entries, double[] ExpressionByCell, bool Excluded, string? Note);

/// <summary>A channel gene present in the table that maps to no entry, with the catalog's reason.</summary>
public sealed record UnmappedChannelGene(string TableId, string Symbol, string Status, string Reason);

/// <summary>Expression of one gene or entry in one group of cells.</summary>
public sealed record GroupStatistic(string Group, int Cells, double Mean, double StandardDeviation, double FractionExpressing);

/// <summary>Cells grouped by a metadata label (e.g. transcriptomic type).</summary>
public sealed class CellGroups
{
    public IReadOnlyDictionary<string, int[]> Members { get; }
    public string Column { get; }

    public CellGroups(IReadOnlyList<string> cellIds, IReadOnlyDictionary<string, string> labelByCell, string column)
    {
        Column = column;
        var m = new SortedDictionary<string, List<int>>(StringComparer.Ordinal);
        for (int i = 0; i < cellIds.Count; i++)
            if (labelByCell.TryGetValue(cellIds[i], out var g) && !string.IsNullOrWhiteSpace(g))
            {
                if (!m.TryGetValue(g, out var list)) m[g] = list = [];
                list.Add(i);
            }
        Members = m.ToDictionary(p => p.Key, p => p.Value.ToArray(), StringComparer.Ordinal);
    }

    public static GroupStatistic Statistic(string group, int[] members, double[] values)
    {
        if (members.Length == 0) return new(group, 0, 0, 0, 0);
        double mean = members.Average(i => values[i]);
        double sd = members.Length > 1 ? Math.Sqrt(members.Sum(i => (values[i] - mean) * (values[i] - mean)) / (members.Length - 1)) : 0;
        double frac = members.Count(i => values[i] > 0) / (double)members.Length;
        return new(group, members.Length, mean, sd, frac);
    }
}

/// <summary>The mapping report: what maps, what does not and why, and what the user changed.</summary>
public sealed class MappingReport
{
    public required string Source { get; init; }
    public required IReadOnlyList<GeneMapping> Genes { get; init; }
    public required IReadOnlyList<UnmappedChannelGene> Unmapped { get; init; }
    /// <summary>Entries linked from the table's species whose genes are absent or never expressed.</summary>
    public required IReadOnlyList<string> EntriesWithoutExpressedGene { get; init; }
    /// <summary>Ambiguous or duplicate identifiers, and overrides that could not be applied.</summary>
    public required IReadOnlyList<string> Problems { get; init; }
    public required Species? Species { get; init; }
    public required IReadOnlyList<GeneOverride> Overrides { get; init; }
    public required int CellCount { get; init; }

    /// <summary>Expression of each entry per cell: the weighted sum of its genes' normalised expression.</summary>
    public IReadOnlyDictionary<string, double[]> EntryExpression()
    {
        var result = new SortedDictionary<string, double[]>(StringComparer.Ordinal);
        foreach (var g in Genes.Where(g => !g.Excluded))
            foreach (var w in g.Entries)
            {
                if (!result.TryGetValue(w.EntryId, out var sum)) result[w.EntryId] = sum = new double[CellCount];
                for (int i = 0; i < CellCount; i++) sum[i] += w.Weight * g.ExpressionByCell[i];
            }
        return result;
    }
}

/// <summary>Maps the genes of an expression table to catalog entries (DOMAIN.md, "Expression to conductance").</summary>
public static class ExpressionMapping
{
    /// <param name="resolver">The resolver that filtered the table's genes while reading (its resolutions are reused); null makes one from the catalog.</param>
    public static MappingReport Map(ExpressionTable table, MappingCatalog catalog, IReadOnlyList<GeneOverride>? overrides = null, GeneResolver? resolver = null)
    {
        overrides ??= [];
        resolver ??= new GeneResolver(catalog.Links, catalog.Statuses, catalog.Identifiers);
        var problems = new List<string>();
        var resolved = new List<ResolvedGene>();
        foreach (var id in table.Genes.Keys)
        {
            var r = resolver.Resolve(id, out var problem);
            if (problem is not null) problems.Add(problem);
            if (r is not null) resolved.Add(r);
        }
        // Two table rows resolving to one gene are reported and neither is merged silently: the first is kept.
        var bySymbol = resolved.GroupBy(r => (r.Symbol, r.Species)).ToArray();
        foreach (var dup in bySymbol.Where(g => g.Count() > 1))
            problems.Add($"{dup.Key.Symbol}: named by several rows ({string.Join(", ", dup.Select(d => d.TableId))}); only '{dup.First().TableId}' is used. Remove or rename the others.");
        var species = resolved.Count == 0 ? (Species?)null : resolved.GroupBy(r => r.Species).OrderByDescending(g => g.Count()).First().Key;

        var genes = new List<GeneMapping>();
        var unmapped = new List<UnmappedChannelGene>();
        var used = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        foreach (var group in bySymbol)
        {
            var r = group.First();
            var links = catalog.Links.Where(l => l.Species == r.Species && l.Symbol == r.Symbol && catalog.Entry(l.EntryId) is not null)
                .Select(l => new EntryWeight(l.EntryId, l.Weight)).ToList();
            var ov = overrides.FirstOrDefault(o => string.Equals(o.Gene, r.Symbol, StringComparison.OrdinalIgnoreCase) || string.Equals(o.Gene, r.TableId, StringComparison.Ordinal));
            string? note = null;
            bool excluded = false;
            if (ov is not null)
            {
                used.Add(ov.Gene);
                if (ov.Exclude) { excluded = true; note = "excluded by the user"; }
                else if (ov.EntryId is { } target)
                {
                    if (catalog.Entry(target) is null) { problems.Add($"override for {r.Symbol}: unknown entry '{target}'."); }
                    else { links = [new EntryWeight(target, ov.Weight ?? 1)]; note = $"re-pointed by the user to {target}"; }
                }
                else if (ov.Weight is { } w)
                {
                    if (!(w >= 0)) problems.Add($"override for {r.Symbol}: weight must be >= 0.");
                    else { links = links.Select(l => l with { Weight = w }).ToList(); note = $"weight set by the user to {w}"; }
                }
            }
            if (links.Count == 0)
            {
                var status = catalog.Statuses.FirstOrDefault(s => s.Species == r.Species && s.Symbol == r.Symbol);
                if (status is not null && status.Status != "linked")
                    unmapped.Add(new UnmappedChannelGene(r.TableId, r.Symbol, status.Status, status.Reason));
                else if (status is not null)
                    unmapped.Add(new UnmappedChannelGene(r.TableId, r.Symbol, "not-modelled", "linked for another species only"));
                continue;
            }
            genes.Add(new GeneMapping(r.TableId, r.Symbol, r.Species, r.How, links, table.Normalised(r.TableId), excluded, note));
        }
        foreach (var o in overrides.Where(o => !used.Contains(o.Gene)))
            problems.Add($"override for '{o.Gene}': the gene is not a mapped channel gene of this table.");

        var expressed = genes.Where(g => !g.Excluded && g.ExpressionByCell.Any(v => v > 0)).SelectMany(g => g.Entries.Select(e => e.EntryId)).ToHashSet(StringComparer.Ordinal);
        var linkedForSpecies = catalog.Links.Where(l => species is null || l.Species == species).Select(l => l.EntryId).Distinct(StringComparer.Ordinal);
        var without = linkedForSpecies.Where(e => !expressed.Contains(e)).Order(StringComparer.Ordinal).ToArray();

        return new MappingReport
        {
            Source = table.Source,
            Genes = genes.OrderBy(g => g.Symbol, StringComparer.Ordinal).ToArray(),
            Unmapped = unmapped.OrderBy(u => u.Symbol, StringComparer.Ordinal).ToArray(),
            EntriesWithoutExpressedGene = without,
            Problems = problems,
            Species = species,
            Overrides = overrides,
            CellCount = table.CellIds.Count,
        };
    }
}
