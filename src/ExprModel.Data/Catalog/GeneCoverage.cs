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

    /// <summary>Every gene with a status (species as given) plus the mouse and rat symbols of links.csv (status linked), sorted.</summary>
    public static IReadOnlyList<GeneCoverageRow> Rows(ChannelCatalog catalog)
    {
        var links = catalog.GeneLinks
            .GroupBy(l => (l.Species, l.Symbol))
            .ToDictionary(g => g.Key, g => (IReadOnlyList<string>)g.OrderBy(l => l.EntryId, StringComparer.Ordinal).Select(Describe).ToArray());
        var rows = new List<GeneCoverageRow>();
        var seen = new HashSet<(Species, string)>();
        foreach (var s in catalog.GeneStatuses)
        {
            seen.Add((s.Species, s.Symbol));
            rows.Add(new GeneCoverageRow(s.Symbol, s.Species, s.Status, links.GetValueOrDefault((s.Species, s.Symbol), []), s.Reason));
        }
        foreach (var ((species, symbol), entries) in links)
            if (seen.Add((species, symbol)))
                rows.Add(new GeneCoverageRow(symbol, species, "linked", entries, "orthologue of a linked human gene"));
        return rows.OrderBy(r => r.Species).ThenBy(r => r.Symbol, StringComparer.Ordinal).ToArray();
    }

    private static string Describe(GeneLink l) =>
        l.Weight == 1 ? l.EntryId : $"{l.EntryId}:{l.Weight.ToString("0.###", CultureInfo.InvariantCulture)}";

    /// <summary>CSV with header <c>symbol,species,status,entries</c>; entries separated by ';'.</summary>
    public static string ToCsv(IEnumerable<GeneCoverageRow> rows)
    {
        var csv = new ExprModel.Core.Export.CsvTable([], ["symbol", "species", "status", "entries"]);
        foreach (var r in rows) csv.Row(r.Symbol, r.Species.ToString().ToLowerInvariant(), r.Status, string.Join(';', r.Entries));
        return csv.ToString();
    }

    /// <summary>
    /// Linked fraction of the human neuronal pore-forming voltage-gated channel genes (<see cref="VoltageGatedPoreSymbol"/>
    /// among the genes with a status, minus those classified non-neuronal).
    /// </summary>
    public static CoverageFigure VoltageGatedPoreCoverage(ChannelCatalog catalog) =>
        Figure("neuronal pore-forming voltage-gated channel genes (human)",
            catalog.GeneStatuses.Where(s => s.Species == Species.Human && VoltageGatedPoreSymbol.IsMatch(s.Symbol) && s.Status != "non-neuronal"));

    /// <summary>Linked fraction of the human neuronal channel pores: linked genes plus not-modelled Nav/Kv/Cav/HCN/Kir/K2P/SK/KNa/NALCN genes.</summary>
    public static CoverageFigure NeuronalPoreCoverage(ChannelCatalog catalog) =>
        Figure("all neuronal pore-forming channel genes with a status (human)",
            catalog.GeneStatuses.Where(s => s.Species == Species.Human && (s.Status == "linked" || (s.Status == "not-modelled" && IsChannelPore(s.Symbol)))));

    private static bool IsChannelPore(string symbol) =>
        VoltageGatedPoreSymbol.IsMatch(symbol) || Regex.IsMatch(symbol, @"^(KCNJ\d+|KCNK\d+|KCNN\d|KCNT\d|NALCN)$", RegexOptions.CultureInvariant);

    private static CoverageFigure Figure(string group, IEnumerable<GeneStatus> genes)
    {
        var list = genes.ToArray();
        var unlinked = list.Where(s => s.Status != "linked").Select(s => s.Symbol).Order(StringComparer.Ordinal).ToArray();
        return new CoverageFigure(group, list.Length - unlinked.Length, list.Length, unlinked);
    }
}
