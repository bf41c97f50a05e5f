using ExprModel.Core.Kinetics;
using ExprModel.Data.Catalog;
using ExprModel.Web.Apis;

namespace ExprModel.Web.Workspace;

/// <summary>Catalog entries shaped for the browser page and the API: summaries, genes, and gate curves at a temperature.</summary>
public static class CatalogViews
{
    public static IReadOnlyList<string> GenesOf(ChannelCatalog catalog, string entryId) =>
        catalog.GeneLinks.Where(l => l.EntryId == entryId).Select(l => l.Symbol)
            .Distinct(StringComparer.OrdinalIgnoreCase).Order(StringComparer.Ordinal).ToArray();

    /// <summary>
    /// The genes feeding an entry, one per symbol (case-folded over species, human spelling first): a proxy when every link of
    /// the symbol to this entry is a proxy, with the link's reason.
    /// </summary>
    public static IReadOnlyList<CatalogGeneLink> GeneLinksOf(ChannelCatalog catalog, string entryId) =>
        catalog.GeneLinks.Where(l => l.EntryId == entryId)
            .GroupBy(l => l.Symbol.ToUpperInvariant(), StringComparer.Ordinal)
            .Select(g =>
            {
                var first = g.OrderBy(l => l.Species).First();
                bool proxy = g.All(l => l.IsProxy);
                return new CatalogGeneLink(first.Symbol, proxy, proxy ? first.Reason : "");
            })
            .OrderBy(l => l.Symbol, StringComparer.Ordinal).ToArray();

    public static CatalogEntrySummary Summary(ChannelCatalog catalog, ChannelEntry e) => new(
        e.Id, e.Version, e.Name, e.Family, Word(e.Ion), GenesOf(catalog, e.Id), e.Source.Short, e.Source.Doi,
        Word(e.Source.Verification), e.ReferenceTemperatureC, e.Q10, e.TypicalDensityMsPerCm2,
        Word(e.Source.CitationCheck), e.Source.CitationCheckedAt, e.Source.CitationNote, GeneLinksOf(catalog, e.Id));

    /// <summary>
    /// Steady state and time constant of each gate from -120 to +60 mV at <paramref name="temperatureC"/>: the entry's own
    /// functions, with the time constant divided by the entry's Q10 factor (<see cref="ChannelEntry.TemperatureFactor"/>).
    /// </summary>
    public static IReadOnlyList<GateCurveSet> Curves(ChannelEntry e, double temperatureC)
    {
        var v = Enumerable.Range(0, 181).Select(i => -120.0 + i).ToArray();
        double factor = e.TemperatureFactor(temperatureC);
        return e.Gates.Select(g => new GateCurveSet(
            g.Name, g.Power, v,
            v.Select(x => g.SteadyStateAt(x)).ToArray(),
            g.Kind is GateKind.Calcium or GateKind.Sodium || g.Instantaneous ? [] : v.Select(x => g.TimeConstantAt(x) / factor).ToArray())).ToArray();
    }

    /// <summary>Voltages of the both-forms table (mV).</summary>
    public static readonly double[] FormVoltagesMv = [-80, -60, -40, -20, 0, 20, 40];

    /// <summary>Each voltage-dependent gate in both forms at <paramref name="temperatureC"/> (<see cref="GateForms"/>); calcium and
    /// instantaneous gates are listed with their parameter count and no table.</summary>
    public static IReadOnlyList<GateFormTable> Forms(ChannelEntry e, double temperatureC) => e.Gates.Select(g => new GateFormTable(
        g.Name, g.Power,
        g.Kind == GateKind.Calcium ? "calcium" : GateForms.WrittenAsRates(g) ? "rates" : "steady-state",
        g.Kind == GateKind.Calcium || g.Instantaneous ? "no voltage-only rate pair (calcium-dependent or instantaneous)"
            : GateForms.WrittenAsRates(g) ? "x_inf = alpha/(alpha + beta), tau = 1/(alpha + beta)" : "alpha = x_inf/tau, beta = (1 - x_inf)/tau",
        GateForms.ParameterCount(g), GateForms.At(e, g, FormVoltagesMv, temperatureC))).ToArray();

    /// <summary>An enum value as the catalog files write it (kebab case).</summary>
    public static string Word<T>(T value) where T : struct, Enum => System.Text.Json.JsonNamingPolicy.KebabCaseLower.ConvertName(value.ToString());

    public static bool Matches(ChannelCatalog catalog, ChannelEntry e, string? query, string? family, string? ion)
    {
        if (!string.IsNullOrWhiteSpace(family) && !e.Family.Equals(family, StringComparison.OrdinalIgnoreCase)) return false;
        if (!string.IsNullOrWhiteSpace(ion) && !Word(e.Ion).Equals(ion, StringComparison.OrdinalIgnoreCase)) return false;
        if (string.IsNullOrWhiteSpace(query)) return true;
        var q = query.Trim();
        return e.Id.Contains(q, StringComparison.OrdinalIgnoreCase) || e.Name.Contains(q, StringComparison.OrdinalIgnoreCase)
            || e.Family.Contains(q, StringComparison.OrdinalIgnoreCase)
            || GenesOf(catalog, e.Id).Any(g => g.Contains(q, StringComparison.OrdinalIgnoreCase));
    }
}
