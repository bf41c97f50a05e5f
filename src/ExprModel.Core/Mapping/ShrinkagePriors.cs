using ExprModel.Core.Expression.Shrinkage;

namespace ExprModel.Core.Mapping;

/// <summary>
/// The gamma-Poisson priors <see cref="PerCellShrinkage"/> fitted, by gene (the table's gene id) and prior set (each
/// metadata group as "group NAME", "the cells without a group", or "every cell of the table" when there are no groups).
/// Fitted once over every cell and stored with the dataset references, they let a part of the table shrink its own cells
/// exactly as the full read does: a cell's estimate needs only its prior, its own counts and its library size.
/// </summary>
public sealed class ShrinkagePriors
{
    private readonly Dictionary<string, Dictionary<string, GammaPoissonPrior>> _byGene = new(StringComparer.Ordinal);

    /// <summary>Gene ids in ordinal order, each with its priors by prior set in ordinal order.</summary>
    public IEnumerable<(string Gene, IEnumerable<(string Set, GammaPoissonPrior Prior)> Priors)> All =>
        _byGene.OrderBy(g => g.Key, StringComparer.Ordinal)
            .Select(g => (g.Key, g.Value.OrderBy(s => s.Key, StringComparer.Ordinal).Select(s => (s.Key, s.Value))));

    /// <summary>How many genes hold priors.</summary>
    public int GeneCount => _byGene.Count;

    public void Add(string gene, string set, GammaPoissonPrior prior)
    {
        if (!_byGene.TryGetValue(gene, out var sets)) _byGene[gene] = sets = new(StringComparer.Ordinal);
        sets[set] = prior;
    }

    /// <summary>The prior of <paramref name="gene"/> over <paramref name="set"/>.</summary>
    /// <exception cref="ArgumentException">No prior was stored for that gene or set (names both).</exception>
    public GammaPoissonPrior Of(string gene, string set)
    {
        if (!_byGene.TryGetValue(gene, out var sets))
            throw new ArgumentException($"no shrinkage prior for gene {gene} (the references were fitted over other genes).");
        return sets.TryGetValue(set, out var prior) ? prior
            : throw new ArgumentException(
                $"no shrinkage prior for gene {gene} over {set} (stored: {string.Join(", ", sets.Keys.Order(StringComparer.Ordinal))}).");
    }
}
