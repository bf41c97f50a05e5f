using System.Collections.Concurrent;
using System.Text.RegularExpressions;
using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

/// <summary>
/// Resolves the identifiers of an expression table to official symbols: exact symbols with their species' case
/// convention (HGNC upper case for human; capitalised for mouse and rat), aliases and Ensembl gene ids (version
/// suffix ignored) from the catalog's identifier table, and symbols written in another case (reported).
/// Ambiguous identifiers (an alias of two genes) are reported, never guessed. Each identifier that names a gene (or is
/// ambiguous) is resolved once and remembered, so the reader's gene filter and the mapping share one resolution.
/// </summary>
public sealed partial class GeneResolver
{
    private readonly Dictionary<string, (string Symbol, Species Species)> _symbols = new(StringComparer.Ordinal);
    private readonly Dictionary<string, List<(string Symbol, Species Species, string Kind)>> _ids = new(StringComparer.OrdinalIgnoreCase);
    private readonly Dictionary<string, (string Symbol, Species Species)> _folded = new(StringComparer.OrdinalIgnoreCase);
    // Only identifiers that resolve or are ambiguous are kept: the rest of a table's genes (and the cell ids seen while
    // detecting orientation) would fill memory for nothing.
    private readonly ConcurrentDictionary<string, (ResolvedGene? Gene, string? Problem)> _resolved = new(StringComparer.Ordinal);

    public GeneResolver(IEnumerable<GeneLink> links, IEnumerable<GeneStatus> statuses, IEnumerable<GeneIdentifier> identifiers)
    {
        // Mouse and rat share most symbols (capitalised); such a symbol is read as mouse, the commoner species, and
        // since rat links mirror mouse links the mapping is the same either way.
        foreach (var (symbol, species) in links.Select(l => (l.Symbol, l.Species)).Concat(statuses.Select(s => (s.Symbol, s.Species))).OrderBy(p => p.Item2))
        {
            _symbols.TryAdd(symbol, (symbol, species));
            _folded.TryAdd(symbol, (symbol, species));
        }
        foreach (var i in identifiers)
        {
            if (!_ids.TryGetValue(i.Identifier, out var list)) _ids[i.Identifier] = list = [];
            if (!list.Any(x => x.Symbol == i.Symbol && x.Species == i.Species)) list.Add((i.Symbol, i.Species, i.Kind));
        }
    }

    [GeneratedRegex(@"^(ENS[A-Z]*G\d{6,})(\.\d+)?$", RegexOptions.IgnoreCase)]
    private static partial Regex EnsemblPattern();

    /// <summary>Resolves one identifier; returns null when it names no channel gene. Ambiguity goes to <paramref name="problem"/>.</summary>
    public ResolvedGene? Resolve(string tableId, out string? problem)
    {
        if (_resolved.TryGetValue(tableId, out var known))
        {
            problem = known.Problem;
            return known.Gene;
        }
        var gene = ResolveOnce(tableId, out problem);
        if (gene is not null || problem is not null) _resolved.TryAdd(tableId, (gene, problem));
        return gene;
    }

    private ResolvedGene? ResolveOnce(string tableId, out string? problem)
    {
        problem = null;
        string id = tableId.Trim();
        if (_symbols.TryGetValue(id, out var exact)) return new(tableId, exact.Symbol, exact.Species, "symbol");
        var ens = EnsemblPattern().Match(id);
        string key = ens.Success ? ens.Groups[1].Value : id;
        if (_ids.TryGetValue(key, out var hits))
        {
            var distinct = hits.Select(h => (h.Symbol, h.Species)).Distinct().ToArray();
            if (distinct.Length > 1)
            {
                problem = $"'{tableId}' is ambiguous: it names {string.Join(", ", distinct.Select(d => d.Symbol))}; rename it in the table or map it by hand.";
                return null;
            }
            var kind = hits[0].Kind;
            string how = kind == "ensembl" ? $"Ensembl id{(ens.Groups[2].Success ? " (version suffix ignored)" : "")}" : $"{kind} of {distinct[0].Symbol}";
            return new(tableId, distinct[0].Symbol, distinct[0].Species, how);
        }
        if (_folded.TryGetValue(id, out var folded))
            return new(tableId, folded.Symbol, folded.Species, $"case differs from the official symbol {folded.Symbol}");
        return null;
    }

    /// <summary>True if the text looks like a gene identifier (symbol or Ensembl id), used to detect table orientation.</summary>
    public bool Knows(string id) => Resolve(id, out _) is not null;
}
