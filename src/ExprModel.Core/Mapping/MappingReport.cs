using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

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

    /// <summary>The proxy links in use: genes of the table feeding another family's kinetics as a stand-in for their own (not excluded).</summary>
    public IReadOnlyList<ProxyLink> Proxies =>
        Genes.Where(g => !g.Excluded)
            .SelectMany(g => g.Entries.Where(e => e.IsProxy).Select(e => new ProxyLink(g.Symbol, e.EntryId, e.ProxyReason!))).ToArray();

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
