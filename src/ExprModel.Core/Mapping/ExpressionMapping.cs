using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Expression;

namespace ExprModel.Core.Mapping;

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
            problems.Add($"{dup.Key.Symbol}: named by several rows ({string.Join(", ", dup.Select(d => d.TableId))}); only '{dup.First().TableId}' is used. " +
                "Remove or rename the others.");
        var species = resolved.Count == 0 ? (Species?)null : resolved.GroupBy(r => r.Species).OrderByDescending(g => g.Count()).First().Key;

        var genes = new List<GeneMapping>();
        var unmapped = new List<UnmappedChannelGene>();
        var used = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        foreach (var group in bySymbol)
        {
            var r = group.First();
            var links = catalog.Links.Where(l => l.Species == r.Species && l.Symbol == r.Symbol && catalog.Entry(l.EntryId) is not null)
                .Select(l => new EntryWeight(l.EntryId, l.Weight, l.IsProxy ? l.Reason : null)).ToList();
            var ov = overrides.FirstOrDefault(o => string.Equals(o.Gene, r.Symbol, StringComparison.OrdinalIgnoreCase)
                || string.Equals(o.Gene, r.TableId, StringComparison.Ordinal));
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

        var expressed = genes.Where(g => !g.Excluded && g.ExpressionByCell.Any(v => v > 0)).SelectMany(g => g.Entries.Select(e => e.EntryId))
            .ToHashSet(StringComparer.Ordinal);
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
