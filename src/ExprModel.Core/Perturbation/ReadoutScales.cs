using ExprModel.Core.Analysis;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// What kind of number each read-out is, for sensitivities and fits: whether a log ratio makes sense, how finely the
/// extractor resolves it (grid searches are quantised), and the misfit scale a fit uses when the user states none.
/// </summary>
public static class ReadoutScales
{
    /// <summary>Absolute potentials and indices that can be zero or change sign: their sensitivity is per unit ln density.</summary>
    private static readonly HashSet<string> Signed = new(StringComparer.Ordinal) { "resting_potential", "spike_threshold", "spike_peak", "adaptation_index" };
    private static readonly HashSet<string> Discrete = new(StringComparer.Ordinal) { "fires_at_rest", "excitability_class" };
    private static readonly HashSet<string> RheobaseGrid = new(StringComparer.Ordinal) { "rheobase", "rheobase_absolute", "adaptation_step" };
    private static readonly HashSet<string> SpikeCounts = new(StringComparer.Ordinal) { "fi_gain", "fi_gain_absolute", "onset_rate", "adaptation_ratio" };

    public static ElasticityKind KindOf(string readout) =>
        Discrete.Contains(readout) ? ElasticityKind.None : Signed.Contains(readout) ? ElasticityKind.PerLogDensity : ElasticityKind.LogRatio;

    /// <summary>
    /// Relative grid step of a read-out found by an onset search (rheobase, sustained onset and the steps sized from
    /// them), or null for read-outs measured on a continuous scale.
    /// </summary>
    public static double? RelativeGridStep(string readout, ReadoutSettings s) =>
        RheobaseGrid.Contains(readout) ? s.RheobaseRelativeTolerance
        : readout == "sustained_firing_onset" ? s.ClassRelativeTolerance
        : readout == "depolarisation_block_onset" ? 0.02
        : null;

    /// <summary>A plain statement of how finely the extractor resolves the read-out with these settings.</summary>
    public static string Quantisation(string readout, ReadoutSettings s) =>
        RelativeGridStep(readout, s) is { } g ? $"onset grid of {Percent(g)} (relative)"
        : SpikeCounts.Contains(readout) ? $"whole spikes in {s.StepDurationMs:0} ms steps"
        : KindOf(readout) == ElasticityKind.None ? "discrete"
        : $"continuous (integration step {s.Simulation.DtMs * 1000:0.#} us)";

    /// <summary>A fraction as an invariant percentage, e.g. "0.5 %".</summary>
    public static string Percent(double fraction) => (100 * fraction).ToString("0.##", System.Globalization.CultureInfo.InvariantCulture) + " %";

    /// <summary>
    /// The misfit scale a fit uses when a target states none (our defaults, not a standard): 1 mV for potentials and
    /// spike heights, 5 % of the target for every other read-out. Recorded spreads within a group are the better choice.
    /// </summary>
    public static double DefaultFitScale(string readout, string unit, double target) =>
        unit == "mV" ? 1.0 : Math.Max(0.05 * Math.Abs(target), 1e-6);
}
