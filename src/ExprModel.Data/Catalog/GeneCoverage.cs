using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;
using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Mapping;

namespace ExprModel.Data.Catalog;

/// <summary>
/// The gene side of the catalog as rows a user or reviewer reads (symbol, species, status, entries), e.g. for
/// <c>exprmodel catalog genes --format csv</c>, and the coverage of neuronal pore-forming voltage-gated channel genes.
/// </summary>
public static class GeneCoverage
{
    /// <summary>
    /// Human symbols of pore-forming voltage-gated channel families (Nav, Kv1-4, Kv7, Kv10-12, BK, HCN, Cav alpha1): the
    /// denominator of the coverage figure, after removing genes the catalog classifies as non-neuronal. Inward
    /// rectifiers, K2P, SK and sodium-activated K channels are not voltage-gated pores and are counted separately.
    /// </summary>
    public static readonly Regex VoltageGatedPoreSymbol = new(@"^(SCN\d+A|KCN[ABCDHQ]\d+|KCNMA1|HCN\d|CACNA1[A-Z])$", RegexOptions.CultureInvariant);

    /// <summary>
    /// Every gene with a status (species as given) plus the mouse and rat symbols of links.csv (status linked), sorted. A linked
    /// gene whose every link is a proxy gets the status "proxy".
    /// </summary>
    public static IReadOnlyList<GeneCoverageRow> Rows(ChannelCatalog catalog)
    {
        var links = catalog.GeneLinks
            .GroupBy(l => (l.Species, l.Symbol))
            .ToDictionary(g => g.Key, g => (IReadOnlyList<string>)g.OrderBy(l => l.EntryId, StringComparer.Ordinal).Select(Describe).ToArray());
        var rows = new List<GeneCoverageRow>();
        var seen = new HashSet<(Species, string)>();
        var proxyOnly = catalog.GeneLinks.GroupBy(l => (l.Species, l.Symbol)).Where(g => g.All(l => l.IsProxy)).Select(g => g.Key).ToHashSet();
        foreach (var s in catalog.GeneStatuses)
        {
            seen.Add((s.Species, s.Symbol));
            string status = s.Status == "linked" && proxyOnly.Contains((s.Species, s.Symbol)) ? GeneLink.ProxyRole : s.Status;
            rows.Add(new GeneCoverageRow(s.Symbol, s.Species, status, links.GetValueOrDefault((s.Species, s.Symbol), []), s.Reason));
        }
        foreach (var ((species, symbol), entries) in links)
            if (seen.Add((species, symbol)))
                rows.Add(new GeneCoverageRow(symbol, species, proxyOnly.Contains((species, symbol)) ? GeneLink.ProxyRole : "linked", entries,
                    "orthologue of a linked human gene"));
        return rows.OrderBy(r => r.Species).ThenBy(r => r.Symbol, StringComparer.Ordinal).ToArray();
    }

    /// <summary>"entry", "entry:0.5" with a weight other than 1, and " (proxy)" after a proxy link.</summary>
    private static string Describe(GeneLink l) =>
        (l.Weight == 1 ? l.EntryId : $"{l.EntryId}:{l.Weight.ToString("0.###", CultureInfo.InvariantCulture)}") + (l.IsProxy ? " (proxy)" : "");

    /// <summary>CSV with header <c>symbol,species,status,entries</c>; entries separated by ';'.</summary>
    public static string ToCsv(IEnumerable<GeneCoverageRow> rows)
    {
        var csv = new ExprModel.Core.Export.CsvTable([], ["symbol", "species", "status", "entries"]);
        foreach (var r in rows) csv.Row(r.Symbol, r.Species.ToString().ToLowerInvariant(), r.Status, string.Join(';', r.Entries));
        return csv.ToString();
    }

    /// <summary>
    /// Fraction of the human neuronal pore-forming voltage-gated channel genes (<see cref="VoltageGatedPoreSymbol"/> among
    /// the genes with a status, minus those classified non-neuronal) linked to kinetics of their own family: a gene linked
    /// only through proxy links is counted as not linked and listed under <see cref="CoverageFigure.ProxyOnly"/>.
    /// </summary>
    public static CoverageFigure VoltageGatedPoreCoverage(ChannelCatalog catalog) => VoltageGatedPoreCoverage(catalog.GeneStatuses, catalog.GeneLinks);

    /// <inheritdoc cref="VoltageGatedPoreCoverage(ChannelCatalog)"/>
    public static CoverageFigure VoltageGatedPoreCoverage(IEnumerable<GeneStatus> statuses, IEnumerable<GeneLink> links) =>
        Figure("neuronal pore-forming voltage-gated channel genes (human)",
            statuses.Where(s => s.Species == Species.Human && VoltageGatedPoreSymbol.IsMatch(s.Symbol) && s.Status != "non-neuronal"), links);

    /// <summary>
    /// Linked fraction of the human neuronal channel pores: linked genes plus not-modelled Nav/Kv/Cav/HCN/Kir/K2P/SK/KNa/NALCN
    /// genes; as above, only links to kinetics of the gene's own family count.
    /// </summary>
    public static CoverageFigure NeuronalPoreCoverage(ChannelCatalog catalog) =>
        Figure("all neuronal pore-forming channel genes with a status (human)",
            catalog.GeneStatuses.Where(s => s.Species == Species.Human && (s.Status == "linked" || (s.Status == "not-modelled" && IsChannelPore(s.Symbol)))),
            catalog.GeneLinks);

    private static bool IsChannelPore(string symbol) =>
        VoltageGatedPoreSymbol.IsMatch(symbol) || Regex.IsMatch(symbol, @"^(KCNJ\d+|KCNK\d+|KCNN\d|KCNT\d|NALCN)$", RegexOptions.CultureInvariant);

    private static CoverageFigure Figure(string group, IEnumerable<GeneStatus> genes, IEnumerable<GeneLink> links)
    {
        var list = genes.ToArray();
        var human = links.Where(l => l.Species == Species.Human).ToArray();
        var own = human.Where(l => !l.IsProxy).Select(l => l.Symbol).ToHashSet(StringComparer.Ordinal);
        var proxied = human.Where(l => l.IsProxy).Select(l => l.Symbol).ToHashSet(StringComparer.Ordinal);
        var unlinked = list.Where(s => s.Status != "linked" || !own.Contains(s.Symbol)).Select(s => s.Symbol).Order(StringComparer.Ordinal).ToArray();
        var proxyOnly = unlinked.Where(proxied.Contains).ToArray();
        return new CoverageFigure(group, list.Length - unlinked.Length, list.Length, unlinked, proxyOnly);
    }
}
