using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>Every standard read-out of a model cell (names are ours; definitions in DEVELOPERS.md, "Read-outs").</summary>
public sealed record CellReadouts
{
    public double? RestingPotentialMv { get; init; }
    public bool FiresAtRest { get; init; }
    public double? InputResistanceMOhm { get; init; }
    public double? MembraneTimeConstantMs { get; init; }
    public double? SagRatio { get; init; }
    public double? RheobaseUaPerCm2 { get; init; }
    public double? RheobasePa { get; init; }
    public double? RheobaseToleranceUaPerCm2 { get; init; }
    public double? ThresholdMv { get; init; }
    public double? PeakMv { get; init; }
    public double? AmplitudeMv { get; init; }
    public double? HalfWidthMs { get; init; }
    public double? AfterHyperpolarisationMv { get; init; }
    public double? MaxRiseMvPerMs { get; init; }
    public double? FirstSpikeLatencyMs { get; init; }
    public IReadOnlyList<FiPoint> FiCurve { get; init; } = [];
    /// <summary>Responses to <see cref="ReadoutSettings.ExtraStepsUaPerCm2"/>, in that order.</summary>
    public IReadOnlyList<FiPoint> ExtraSteps { get; init; } = [];
    public double? FiGainHzPerUaPerCm2 { get; init; }
    public double? FiGainHzPerNa { get; init; }
    public double? SustainedFiringOnsetUaPerCm2 { get; init; }
    public double? OnsetRateHz { get; init; }
    public int? ExcitabilityClass { get; init; }
    public double? AdaptationStepUaPerCm2 { get; init; }
    public double? AdaptationRatio { get; init; }
    public double? AdaptationIndex { get; init; }
    public double? DepolarisationBlockUaPerCm2 { get; init; }
    public double? BlockSearchLimitUaPerCm2 { get; init; }
    public double AreaUm2 { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];
    /// <summary>False for a first stage (<see cref="Features.MeasureFirst"/>): the f-I curve and what depends on it are still to come.</summary>
    public bool IsComplete { get; init; } = true;
    /// <summary>The settled state at zero current that every protocol starts from (kept for the second stage).</summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public CellState? RestState { get; init; }
    /// <summary>Steady-state slope conductance at rest (mS/cm2) that sized the passive steps (kept for the second stage).</summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public double? SlopeConductanceMsPerCm2 { get; init; }

    /// <summary>The rheobase search saw a step spike and a larger one not (the note says which); see <see cref="Hint"/>.</summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public bool SpikingNotMonotone { get; init; }

    /// <summary>
    /// What the rheobase search of a similar cell (this cell with one channel's density changed) can start from; null
    /// without a rheobase, and null when this cell's spiking is not monotone in the step amplitude: its neighbours are
    /// likely to have such a gap too, and a seeded search can then settle in another spiking window than an unseeded one
    /// (a cold measurement). Measured on the demo cells, each channel's relative density set to 49 %, 95 % or 173 %:
    /// changes from the 6 cells with a gap gave 1 such disagreement in 126, changes from 40 other cells (every sixth)
    /// none in 1,056.
    /// </summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public RheobaseHint? Hint => !SpikingNotMonotone && RheobaseUaPerCm2 is { } r && SlopeConductanceMsPerCm2 is { } g ? new RheobaseHint(r, g) : null;

    /// <summary>Names (as in <see cref="Rows"/>) of the read-outs that only the second stage (<see cref="Features.Complete"/>) measures.</summary>
    public static IReadOnlySet<string> SecondStageNames { get; } = new HashSet<string>(StringComparer.Ordinal)
    {
        "sag_ratio", "fi_gain", "fi_gain_absolute", "sustained_firing_onset", "onset_rate", "excitability_class", "adaptation_step", "adaptation_ratio",
        "adaptation_index", "depolarisation_block_onset",
    };

    /// <summary>Every scalar read-out as (name, unit, value) rows, in a fixed order, for tables and CSV.</summary>
    public IEnumerable<(string Name, string Unit, double? Value)> Rows()
    {
        yield return ("resting_potential", "mV", RestingPotentialMv);
        yield return ("fires_at_rest", "0/1", FiresAtRest ? 1 : 0);
        yield return ("input_resistance", "MOhm", InputResistanceMOhm);
        yield return ("membrane_time_constant", "ms", MembraneTimeConstantMs);
        yield return ("sag_ratio", "fraction", SagRatio);
        yield return ("rheobase", "uA/cm2", RheobaseUaPerCm2);
        yield return ("rheobase_absolute", "pA", RheobasePa);
        yield return ("spike_threshold", "mV", ThresholdMv);
        yield return ("spike_peak", "mV", PeakMv);
        yield return ("spike_amplitude", "mV", AmplitudeMv);
        yield return ("spike_half_width", "ms", HalfWidthMs);
        yield return ("after_hyperpolarisation", "mV", AfterHyperpolarisationMv);
        yield return ("max_rise_rate", "mV/ms", MaxRiseMvPerMs);
        yield return ("first_spike_latency", "ms", FirstSpikeLatencyMs);
        yield return ("fi_gain", "Hz per uA/cm2", FiGainHzPerUaPerCm2);
        yield return ("fi_gain_absolute", "Hz/nA", FiGainHzPerNa);
        yield return ("sustained_firing_onset", "uA/cm2", SustainedFiringOnsetUaPerCm2);
        yield return ("onset_rate", "Hz", OnsetRateHz);
        yield return ("excitability_class", "1 or 2", ExcitabilityClass);
        yield return ("adaptation_step", "uA/cm2", AdaptationStepUaPerCm2);
        yield return ("adaptation_ratio", "last/first ISI", AdaptationRatio);
        yield return ("adaptation_index", "mean normalised ISI change", AdaptationIndex);
        yield return ("depolarisation_block_onset", "uA/cm2", DepolarisationBlockUaPerCm2);
    }
}
