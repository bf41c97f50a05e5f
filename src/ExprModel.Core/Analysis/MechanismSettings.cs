using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>Settings of the adaptation-mechanism protocol (<see cref="AdaptationMechanisms"/>): the train and the threshold probe.</summary>
public sealed record MechanismSettings
{
    public SimulationSettings Simulation { get; init; } = SimulationSettings.Default;
    /// <summary>Settling at zero current before every run (ms).</summary>
    public double SettleMs { get; init; } = 1000;
    /// <summary>Length of the suprathreshold step that drives the train (ms).</summary>
    public double StepDurationMs { get; init; } = 1000;
    /// <summary>Without a given amplitude the step is this multiple of the rheobase (the adaptation read-out's own choice).</summary>
    public double StepRheobaseMultiple { get; init; } = 2;
    /// <summary>dV/dt criterion of the spike threshold (mV/ms), 20 by common practice.</summary>
    public double ThresholdSlopeMvPerMs { get; init; } = 20;
    /// <summary>Width of the brief test pulse (ms).</summary>
    public double ProbePulseMs { get; init; } = 2;
    /// <summary>Delay of the test pulse after the conditioning spike's detection crossing, and after the end of the train (ms).</summary>
    public double ProbeDelayMs { get; init; } = 20;
    /// <summary>The pulse threshold is searched until the bracket is this fraction of its upper end.</summary>
    public double ProbeRelativeTolerance { get; init; } = 0.005;
    /// <summary>How long after the test pulse's onset a spike counts as evoked by it (ms).</summary>
    public double ProbeWindowMs { get; init; } = 30;

    public static MechanismSettings Default { get; } = new();

    /// <summary>Returns the first bad setting, named, or null.</summary>
    public string? Problem()
    {
        if (!(StepDurationMs >= 50 && StepDurationMs <= 10_000)) return $"stepDurationMs must lie in [50, 10000] (got {StepDurationMs})";
        if (!(StepRheobaseMultiple > 1 && StepRheobaseMultiple <= 20)) return $"stepRheobaseMultiple must lie in (1, 20] (got {StepRheobaseMultiple})";
        if (!(ProbePulseMs > 0 && ProbePulseMs <= 20)) return $"probePulseMs must lie in (0, 20] (got {ProbePulseMs})";
        if (!(ProbeDelayMs >= 2 && ProbeDelayMs <= 2000)) return $"probeDelayMs must lie in [2, 2000] (got {ProbeDelayMs})";
        if (!(ProbeRelativeTolerance > 0 && ProbeRelativeTolerance <= 0.1))
            return $"probeRelativeTolerance must lie in (0, 0.1] (got {ProbeRelativeTolerance})";
        return null;
    }
}
