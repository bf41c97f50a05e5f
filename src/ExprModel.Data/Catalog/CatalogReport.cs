using System.Globalization;
using System.Text;
using ExprModel.Core.Kinetics;

namespace ExprModel.Data.Catalog;

/// <summary>
/// A plain-text (markdown) review sheet of the catalog: for every entry its family and band, ion and reversal rule,
/// temperature and Q10, density range, citation with DOI and verification status, curator note, half-activations,
/// time-constant range over -100..+40 mV and a table of steady state and time constant at 10 mV steps.
/// </summary>
public static class CatalogReport
{
    /// <summary>Voltage range of the time-constant summary and the table (mV).</summary>
    public const double FromMv = -100, ToMv = 40, TableStepMv = 10;

    /// <summary>Intracellular calcium (mM) at which calcium gates are tabulated: 1 uM, a level reached near active calcium channels.</summary>
    public const double TableCalciumMm = 1e-3;

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>The whole report: a summary table, then one section per entry (latest versions, or every version).</summary>
    public static string Markdown(ChannelCatalog catalog, bool allVersions = false)
    {
        var entries = allVersions ? catalog.AllVersions : catalog.Latest;
        var sb = new StringBuilder();
        sb.Append("# Channel catalog review\n\n");
        int recalled = entries.Count(e => e.Source.Verification == Verification.Recalled);
        sb.Append(Inv, $"{entries.Count} entries. Parameters: {recalled} recalled, {entries.Count - recalled} checked against the paper. Citations: " +
            $"{entries.Count(e => e.Source.CitationCheck == CitationCheck.Confirmed)} confirmed on an abstract page, " +
            $"{entries.Count(e => e.Source.CitationCheck == CitationCheck.NotFound)} with no page found, " +
            $"{entries.Count(e => e.Source.CitationCheck == CitationCheck.Unchecked)} unchecked.\n\n");
        var pore = GeneCoverage.VoltageGatedPoreCoverage(catalog);
        if (pore.Total > 0)
        {
            string proxyNote = pore.ProxyOnly.Count > 0 ? $" ({string.Join(", ", pore.ProxyOnly)} feed another family's kinetics as proxies)" : "";
            string unlinked = pore.Unlinked.Count == 0 ? "none unlinked" : $"unlinked: {string.Join(", ", pore.Unlinked)}";
            sb.Append(Inv, $"Gene coverage: {pore.Linked} of {pore.Total} {pore.Group} linked to kinetics of their own family ({pore.Fraction:P0}); " +
                $"{unlinked}{proxyNote}.\n\n");
        }
        var proxies = catalog.GeneLinks.Where(l => l.IsProxy && l.Species == ExprModel.Core.Expression.Identifiers.Species.Human).ToArray();
        if (proxies.Length > 0)
        {
            sb.Append("Proxy links (human; mouse and rat follow):\n\n");
            foreach (var l in proxies) sb.Append(Inv, $"- {l.Symbol} -> {l.EntryId}: proxy, {l.Reason}\n");
            sb.Append('\n');
        }
        sb.Append("| entry | family | ion | reversal | T (C) | Q10 | half-activation (mV) | citation | parameters |\n");
        sb.Append("| --- | --- | --- | --- | --- | --- | --- | --- | --- |\n");
        foreach (var e in entries)
            sb.Append(Inv, $"| {e.Key} | {e.Family} | {Word(e.Ion)} | {ReversalText(e)} | {e.ReferenceTemperatureC:0.#} | {e.Q10:0.##} | {HalfSummary(e)} | " +
                $"{Word(e.Source.CitationCheck)} | {Word(e.Source.Verification)} |\n");
        sb.Append('\n');
        foreach (var e in entries) sb.Append(Entry(e)).Append('\n');
        return sb.ToString();
    }

    /// <summary>One entry's section.</summary>
    public static string Entry(ChannelEntry e)
    {
        var sb = new StringBuilder();
        var s = e.Source;
        sb.Append(Inv, $"## {e.Key}: {e.Name}\n\n");
        sb.Append(Inv, $"- Family: {e.Family}{BandText(e.Family)}\n");
        sb.Append(Inv, $"- Ion: {Word(e.Ion)}; reversal: {ReversalText(e)}\n");
        sb.Append(Inv, $"- Temperature of origin: {e.ReferenceTemperatureC:0.##} C; Q10 {e.Q10:0.##} (rates x{e.TemperatureFactor(36):0.###} at 36 C)\n");
        sb.Append(Inv, $"- Density: typical {e.TypicalDensityMsPerCm2:G4} mS/cm2 (plausible {e.MinDensityMsPerCm2:G4} to {e.MaxDensityMsPerCm2:G4})\n");
        sb.Append(Inv, $"- Source: {s.Authors} ({s.Year}). {s.Title}. {s.Journal} {s.Volume}{(s.Pages.Length > 0 ? ":" + s.Pages : "")}. DOI: " +
            $"{(s.Doi.Length > 0 ? s.Doi : "(none recorded)")}\n");
        sb.Append(Inv, $"- From: {s.Location}\n");
        sb.Append("- Citation: ").Append(CitationStatus(s)).Append('\n');
        sb.Append("- Parameters: ").Append(ParameterStatus(s)).Append('\n');
        if (e.SourceDensity is { } d)
            sb.Append(Inv, $"- Conductance in the paper: {d.Describe()} ({d.Where})\n");
        if (e.Preparation.Length > 0) sb.Append(Inv, $"- Preparation: {e.Preparation}\n");
        if (e.CuratorNote.Length > 0) sb.Append(Inv, $"- Curator note: {e.CuratorNote}\n");
        if (e.Gates.Count == 0)
        {
            sb.Append("- Gates: none (voltage- and time-independent conductance)\n");
            return sb.ToString();
        }
        foreach (var g in e.Gates) sb.Append("- ").Append(GateText(g)).Append('\n');
        foreach (var p in e.PublishedValues)
            sb.Append(Inv,
                $"- Published: {p.Quantity} of {p.Gate} = {p.Value:G6}{(p.Quantity == "tau-at" || p.Quantity == "steady-at" ? $" at {p.AtMv:0.##} mV" : "")} " +
                $"(tolerance {p.Tolerance:G3}; {p.Where})\n");
        sb.Append('\n').Append(Table(e));
        return sb.ToString();
    }

    /// <summary>Whether the citation was compared with the paper's abstract page, with the page's address or what was searched.</summary>
    public static string CitationStatus(Citation s) => s.CitationCheck switch
    {
        CitationCheck.Confirmed => $"confirmed against {s.CitationCheckedAt}{(s.CitationNote.Length > 0 ? " (" + s.CitationNote + ")" : "")}",
        CitationCheck.NotFound => $"no abstract page found ({s.CitationNote})",
        _ => "not yet compared with an abstract page",
    };

    /// <summary>Whether the parameters were read from the paper's equations or recalled.</summary>
    public static string ParameterStatus(Citation s) => s.Verification == Verification.Checked
        ? "checked against the paper's equations"
        : "RECALLED - not checked against the paper's equations";

    /// <summary>Steady state and time constant (ms, at the entry's own temperature) of every gate at 10 mV steps.</summary>
    public static string Table(ChannelEntry e)
    {
        var sb = new StringBuilder("| V (mV) |");
        foreach (var g in e.Gates)
            sb.Append(Inv, $" {g.Name}_inf{(g.DependsOnCalcium ? " (1 uM Ca)" : "")} | tau_{g.Name} (ms) |");
        sb.Append("\n| ---: |");
        foreach (var _ in e.Gates) sb.Append(" ---: | ---: |");
        sb.Append('\n');
        for (double v = FromMv; v <= ToMv + 1e-9; v += TableStepMv)
        {
            sb.Append(Inv, $"| {v:0} |");
            foreach (var g in e.Gates)
            {
                double ca = g.DependsOnCalcium ? TableCalciumMm : GateRate.RestingCalciumMm;
                string tau = g.Instantaneous ? "inst." : g.TimeConstantAt(v, ca).ToString("G4", Inv);
                sb.Append(Inv, $" {g.SteadyStateAt(v, ca):0.0000} | {tau} |");
            }
            sb.Append('\n');
        }
        return sb.ToString();
    }

    /// <summary>
    /// Voltage (mV) where the gate's steady state crosses 0.5, by bisection on [-150, 100] mV; null when it does not cross
    /// (e.g. a gate with a non-inactivating floor) or depends on calcium. A Boltzmann steady state that the source wrote as a
    /// root (exponent 1/p, so that x^p is a plain Boltzmann) is evaluated before the root, so the result is the half-activation
    /// the source states.
    /// </summary>
    public static double? HalfActivationMv(GateSpec gate)
    {
        if (gate.DependsOnCalcium || gate.DependsOnSodium) return null;
        Func<double, double> f = gate.Kind == GateKind.SteadyStateAndTau && gate.SteadyState is { Shape: RateShape.Boltzmann, Exponent: not 1 } b
            ? v => (b with { Exponent = 1 }).Evaluate(v)
            : v => gate.SteadyStateAt(v);
        return Bisect(f, -150, 100);
    }

    /// <summary>Voltage (mV) where the gate's contribution x_inf^p to the open probability crosses 0.5 (the conductance's half-activation).</summary>
    public static double? ConductanceHalfActivationMv(GateSpec gate) =>
        gate.DependsOnCalcium || gate.DependsOnSodium ? null : Bisect(v => Math.Pow(gate.SteadyStateAt(v), gate.Power), -150, 100);

    /// <summary>Intracellular calcium (mM) at which a calcium gate's steady state at <paramref name="vMv"/> is 0.5, by bisection in log
    /// concentration.</summary>
    public static double? CalciumHalfActivationMm(GateSpec gate, double vMv)
    {
        if (!gate.DependsOnCalcium) return null;
        var logCa = Bisect(x => gate.SteadyStateAt(vMv, Math.Pow(10, x)), -9, 2);
        return logCa is { } l ? Math.Pow(10, l) : null;
    }

    /// <summary>True when the gate closes with depolarisation (its steady state is larger at -100 mV than at +40 mV).</summary>
    public static bool ClosesWithDepolarisation(GateSpec gate) => gate.SteadyStateAt(FromMv) > gate.SteadyStateAt(ToMv);

    /// <summary>Smallest and largest time constant (ms) over -100..+40 mV in 1 mV steps, at resting calcium; null for instantaneous gates.</summary>
    public static (double MinMs, double MaxMs)? TimeConstantRangeMs(GateSpec gate)
    {
        if (gate.Instantaneous) return null;
        double min = double.PositiveInfinity, max = double.NegativeInfinity;
        for (double v = FromMv; v <= ToMv + 1e-9; v += 1)
        {
            double t = gate.TimeConstantAt(v);
            min = Math.Min(min, t);
            max = Math.Max(max, t);
        }
        return (min, max);
    }

    private static double? Bisect(Func<double, double> f, double lo, double hi)
    {
        double flo = f(lo) - 0.5, fhi = f(hi) - 0.5;
        if (double.IsNaN(flo) || double.IsNaN(fhi) || flo * fhi > 0) return null;
        for (int i = 0; i < 200 && hi - lo > 1e-9; i++)
        {
            double mid = 0.5 * (lo + hi), fm = f(mid) - 0.5;
            if ((fm > 0) == (fhi > 0)) { hi = mid; fhi = fm; }
            else { lo = mid; }
        }
        return 0.5 * (lo + hi);
    }

    private static string GateText(GateSpec g)
    {
        var sb = new StringBuilder();
        sb.Append(Inv, $"Gate {g.Name}^{g.Power} " +
            $"({Word(g.Kind)}{(g.Instantaneous ? ", instantaneous" : "")}{(g.RateFactor != 1 ? $", rate factor {g.RateFactor:G4}" : "")}): ");
        if (g.DependsOnCalcium)
        {
            var half0 = CalciumHalfActivationMm(g, 0);
            sb.Append(Inv, $"calcium half-activation {(half0 is { } h ? (h * 1000).ToString("G4", Inv) + " uM" : "n/a")} at 0 mV");
            if (g.Calcium is { } c) sb.Append(Inv, $" (Hill {c.HillCoefficient:G3}, tau {c.TimeConstantMs:G4} ms)");
            else
            {
                var halfNeg = CalciumHalfActivationMm(g, -40);
                var halfPos = CalciumHalfActivationMm(g, 40);
                sb.Append(Inv, $", {(halfNeg is { } n ? (n * 1000).ToString("G4", Inv) + " uM" : "n/a")} at -40 mV, " +
                    $"{(halfPos is { } p ? (p * 1000).ToString("G4", Inv) + " uM" : "n/a")} at +40 mV; " +
                    $"tau {g.TimeConstantAt(0, TableCalciumMm):G4} ms at 0 mV and 1 uM");
            }
            return sb.ToString();
        }
        if (g.Sodium is { } na)
        {
            sb.Append(Inv, $"sodium half-activation {na.HalfActivationMm:G4} mM of shell sodium (Hill {na.HillCoefficient:G3}, ");
            sb.Append(g.Instantaneous ? "follows sodium instantly)" : string.Format(Inv, "tau {0:G4} ms)", na.TimeConstantMs));
            return sb.ToString();
        }
        var half = HalfActivationMv(g);
        var cond = ConductanceHalfActivationMv(g);
        string what = ClosesWithDepolarisation(g) ? "half-(in)activation" : "half-activation";
        sb.Append(Inv, $"{what} {(half is { } x ? x.ToString("0.0", Inv) + " mV" : "none in -150..100 mV")}");
        if (g.SteadyState is { Shape: RateShape.Boltzmann, Exponent: not 1 } root)
            sb.Append(Inv, $" (of the Boltzmann before the source's power {root.Exponent:G3})");
        if (g.Power != 1 && cond is { } cv) sb.Append(Inv, $" ({g.Name}^{g.Power} crosses 0.5 at {cv:0.0} mV)");
        var range = TimeConstantRangeMs(g);
        sb.Append(range is { } r
            ? string.Format(Inv, "; tau {0:G3} to {1:G4} ms over -100..+40 mV", r.MinMs, r.MaxMs)
            : "; no time constant (follows V instantly)");
        return sb.ToString();
    }

    private static string HalfSummary(ChannelEntry e)
    {
        var parts = e.Gates.Select(g => g.DependsOnCalcium
            ? $"{g.Name}: Ca {((CalciumHalfActivationMm(g, 0) ?? double.NaN) * 1000).ToString("G3", Inv)} uM"
            : g.Sodium is { } na ? $"{g.Name}: Na {na.HalfActivationMm.ToString("G3", Inv)} mM"
            : $"{g.Name}: {(HalfActivationMv(g) is { } h ? h.ToString("0.0", Inv) : "-")}").ToArray();
        return parts.Length == 0 ? "-" : string.Join("; ", parts);
    }

    private static string BandText(string family) =>
        ChannelFamilies.Bands.TryGetValue(family, out var b)
            ? string.Format(Inv, " (band: activation {0:0} to {1:0} mV{2})", b.ActivationLowMv, b.ActivationHighMv,
                b.InactivationLowMv is { } lo && b.InactivationHighMv is { } hi ? string.Format(Inv, ", inactivation {0:0} to {1:0} mV", lo, hi) : "")
            : " (no voltage band)";

    private static string ReversalText(ChannelEntry e) => e.Reversal switch
    {
        ReversalRule.Fixed => string.Format(Inv, "fixed {0:0.###} mV", e.ReversalMv ?? double.NaN),
        ReversalRule.GoldmanHodgkinKatz => "Goldman-Hodgkin-Katz",
        _ => "Nernst",
    };

    private static string Word<T>(T value) where T : struct, Enum => CatalogBuilder.Word(value);
}
