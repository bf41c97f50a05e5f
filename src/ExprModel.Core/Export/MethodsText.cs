using System.Globalization;
using System.Text;
using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Models;

namespace ExprModel.Core.Export;

/// <summary>
/// A methods paragraph for a paper, written from the model as it is simulated: the cell, every channel with its source
/// (cited by the BibTeX keys of <see cref="BibTex.For"/>), density, reversal, the temperature of its kinetics and its Q10
/// scaling; how densities were derived; the integration method and step; the protocols and read-out definitions; and the
/// software and catalog versions. The research-use caution closes it.
/// </summary>
public static class MethodsText
{
    public static string Write(Models.ModelDocument doc, CellModel model, MethodsVersions versions, ReadoutSettings? readouts = null,
        string? protocolSentence = null)
    {
        var r = readouts ?? ReadoutSettings.Default;
        var (_, keys) = BibTex.For(model, doc.Citation, versions);
        var g = model.Geometry;
        var sb = new StringBuilder();
        sb.Append(Invariant($"Simulations used a single-compartment conductance-based (Hodgkin-Huxley type) model, \"{model.Name}\""));
        if (!string.IsNullOrWhiteSpace(doc.Citation)) sb.Append(" (").Append(doc.Citation.Trim().TrimEnd('.')).Append(')');
        sb.Append(Invariant($", with a membrane area of {N(g.AreaUm2)} um2 and a specific capacitance of {N(g.CapacitanceUfPerCm2)} uF/cm2 "));
        sb.Append(Invariant($"({N(g.AreaUm2 * g.CapacitanceUfPerCm2 * 1e-2)} pF), at {N(model.TemperatureC)} °C. "));
        sb.Append("The membrane potential obeyed C dV/dt = -sum_k g_k prod_j x_j^p_j (V - E_k) + I_stim, each gate x following ")
            .Append("dx/dt = alpha(V)(1 - x) - beta(V) x, or equivalently (x_inf(V) - x)/tau(V) with x_inf = alpha/(alpha + beta) and ")
            .Append("tau = 1/(alpha + beta). ");
        sb.Append(Invariant($"It contained {model.Channels.Count} channel{(model.Channels.Count == 1 ? "" : "s")}: "));
        sb.Append(string.Join("; ", model.Channels.Select(c => Channel(model, c, keys[c.Entry.Key])))).Append(". ");
        sb.Append("Rates were scaled to the model temperature by Q10^((T - T_ref)/10) (common practice). ");
        if (model.CalciumShell is { } shell)
            sb.Append(Invariant($"Calcium entering through calcium channels filled a submembrane shell {N(shell.DepthUm)} um deep that relaxed to ") +
                Invariant($"{N(shell.RestMm * 1e6)} nM with a time constant of {N(shell.DecayMs)} ms. "));
        sb.Append(Derivation(doc));
        double dtUs = r.Simulation.DtMs * 1000;
        sb.Append(Invariant($"Equations were integrated with a fixed step of {N(dtUs)} us by a staggered exponential scheme: each gate took ") +
            "the exact exponential update x <- x_inf + (x - x_inf) exp(-dt/tau) for the voltage at the step's midpoint (rates tabulated on a " +
            "0.01 mV grid), and V the exact update of the membrane equation with conductances frozen (second order in the step). ");
        sb.Append(Invariant($"Protocols: the cell first settled for {N(r.SettleMs)} ms at zero current; current steps started after a ") +
            Invariant($"{N(Protocols.BaselineMs)} ms baseline. "));
        if (!string.IsNullOrWhiteSpace(protocolSentence)) sb.Append(protocolSentence.Trim()).Append(' ');
        sb.Append(Invariant($"Spikes were upward crossings of -20 mV; spike threshold was the potential where dV/dt exceeded ") +
            Invariant($"{N(r.ThresholdSlopeMvPerMs)} mV/ms before the crossing; rheobase the smallest {N(r.StepDurationMs)} ms step evoking a spike ") +
            Invariant($"(tolerance {N(r.RheobaseAbsoluteToleranceUaPerCm2)} uA/cm2 or {N(r.RheobaseRelativeTolerance * 100)} %); input resistance ") +
            Invariant($"from a {N(r.PassiveStepMs)} ms hyperpolarising step aimed at {N(r.PassiveDeflectionMv)} mV; the f-I curve from ") +
            Invariant($"{r.FiSteps} steps up to {N(r.FiMaxMultiple)} times rheobase; adaptation ratio as last over first inter-spike interval ") +
            "on a step at twice rheobase; after-hyperpolarisation as threshold minus the trough before the next spike. ");
        sb.Append(Invariant($"Software: ExprModel {versions.Software}; channel catalog {versions.Catalog}; entries pinned as ") +
            string.Join(", ", model.Channels.Select(c => $"{c.Entry.Id} v{c.Entry.Version}")) + ". ");
        sb.Append(ResearchCaution.Text);
        return sb.ToString();
    }

    private static string Channel(CellModel model, ChannelInstance c, string key)
    {
        var e = c.Entry;
        string rel = Math.Abs(c.RelativeDensity - 1) > 1e-12 ? Invariant($" x {N(c.RelativeDensity)} relative") : "";
        string extra = (c.ShiftMv != 0 ? Invariant($", shifted {N(c.ShiftMv)} mV") : "") + (c.TauScale != 1 ? Invariant($", tau x {N(c.TauScale)}") : "");
        string firstAuthor = e.Source.Authors.Split(',')[0] + (e.Source.Authors.Contains(',') ? " et al." : "");
        return Invariant($"{e.Name} ({e.Family}, {firstAuthor} {e.Source.Year} [{key}]) ") +
            Invariant($"at {N(c.DensityMsPerCm2)} mS/cm2{rel}, E = {N(model.ReversalPotentialMv(c))} mV, kinetics at {N(e.ReferenceTemperatureC)} °C ") +
            Invariant($"with Q10 = {N(e.Q10)} (rate factor {N(e.TemperatureFactor(model.TemperatureC))}){extra}");
    }

    private static string Derivation(Models.ModelDocument doc)
    {
        if (doc.Derivation is null) return "Densities were those of the published model or as set by the user. ";
        var d = doc.Derivation;
        string Field(string name) => d[name]?.ToString() ?? "";
        var parts = new[] { ("method", Field("method")), ("target", Field("target")), ("reference", Field("reference")), ("exponent", Field("exponent")),
            ("table unit", Field("unit")) }.Where(p => p.Item2.Length > 0).Select(p => $"{p.Item1}: {p.Item2}");
        return "Densities were derived from ion-channel gene expression (mRNA), each entry's typical published density scaled by its " +
            $"expression relative to a reference ({string.Join("; ", parts)}); mRNA is not functional channel density. ";
    }

    /// <summary>Numbers as a paper prints them: six significant figures at most, no trailing zeros, invariant culture.</summary>
    public static string N(double x)
    {
        if (x == 0 || !double.IsFinite(x)) return x.ToString(CultureInfo.InvariantCulture);
        int digits = Math.Max(0, 5 - (int)Math.Floor(Math.Log10(Math.Abs(x))));
        return Math.Round(x, Math.Min(15, digits)).ToString("0.###############", CultureInfo.InvariantCulture);
    }

    private static string Invariant(FormattableString s) => s.ToString(CultureInfo.InvariantCulture);
}
