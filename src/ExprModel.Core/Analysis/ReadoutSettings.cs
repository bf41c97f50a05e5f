using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>Settings of the standard read-outs; defaults follow common practice (see DEVELOPERS.md, "Read-outs").</summary>
public sealed record ReadoutSettings
{
    public SimulationSettings Simulation { get; init; } = SimulationSettings.Default;
    /// <summary>Time at zero current before any protocol, so every protocol starts from rest.</summary>
    public double SettleMs { get; init; } = 1000;
    /// <summary>Step length for rheobase, shape and adaptation (DOMAIN: default 1 s).</summary>
    public double StepDurationMs { get; init; } = 1000;
    /// <summary>Length of the small hyperpolarising step (ms); input resistance uses its last 20 ms.</summary>
    public double PassiveStepMs { get; init; } = 500;
    /// <summary>Further step amplitudes (uA/cm2) measured in the same sweep as the f-I curve (see <see cref="CellReadouts.ExtraSteps"/>).</summary>
    public IReadOnlyList<double> ExtraStepsUaPerCm2 { get; init; } = [];
    /// <summary>Hyperpolarising deflection aimed at for input resistance and time constant (mV).</summary>
    public double PassiveDeflectionMv { get; init; } = -5;
    /// <summary>Hyperpolarising deflection aimed at for sag (mV).</summary>
    public double SagDeflectionMv { get; init; } = -25;
    /// <summary>dV/dt criterion for the voltage threshold (mV/ms), 20 by common practice.</summary>
    public double ThresholdSlopeMvPerMs { get; init; } = 20;
    /// <summary>Rheobase bisection stops when the bracket is below max(absolute, relative * value).</summary>
    public double RheobaseAbsoluteToleranceUaPerCm2 { get; init; } = 0.001;
    public double RheobaseRelativeTolerance { get; init; } = 0.005;
    /// <summary>Adaptation is measured on a step of this multiple of rheobase.</summary>
    public double AdaptationStepMultiple { get; init; } = 2;
    /// <summary>f-I curve read-out: steps from 0 to this multiple of rheobase.</summary>
    public double FiMaxMultiple { get; init; } = 3;
    public int FiSteps { get; init; } = 16;
    /// <summary>Step length for the class test: the late window (second half) must hold two spikes to count as sustained.</summary>
    public double ClassStepMs { get; init; } = 2000;
    /// <summary>Relative tolerance of the search for the onset of sustained firing.</summary>
    public double ClassRelativeTolerance { get; init; } = 0.005;
    /// <summary>Onset rate below which excitability is class 1 (continuous onset), in Hz. Our setting; see DEVELOPERS.md.</summary>
    public double ClassOneOnsetRateHz { get; init; } = 10;
    /// <summary>Depolarisation block is searched up to this multiple of rheobase.</summary>
    public double BlockSearchMultiple { get; init; } = 20;

    /// <summary>Measure sag (one extra 1 s run).</summary>
    public bool IncludeSag { get; init; } = true;
    /// <summary>Search for depolarisation block (the most expensive read-out).</summary>
    public bool IncludeDepolarisationBlock { get; init; } = true;

    public static ReadoutSettings Default { get; } = new();

    /// <summary>
    /// The batch read-outs: shorter settling, 2 % rheobase tolerance, 8 f-I steps, class judged on 1 s steps (bracketed
    /// by the f-I curve, 5 % tolerance), no sag or block search.
    /// </summary>
    public static ReadoutSettings Batch { get; } = new()
    {
        SettleMs = 300,
        PassiveStepMs = 300,
        RheobaseRelativeTolerance = 0.02,
        RheobaseAbsoluteToleranceUaPerCm2 = 0.005,
        FiSteps = 8,
        ClassStepMs = 1000,
        ClassRelativeTolerance = 0.05,
        IncludeSag = false,
        IncludeDepolarisationBlock = false,
    };

    /// <summary>
    /// Read-outs repeated after each small change of a model's densities: the batch settings plus sag. The
    /// depolarisation-block search is left out (run the full read-outs for it).
    /// </summary>
    public static ReadoutSettings Live { get; } = Batch with { IncludeSag = true };
}
