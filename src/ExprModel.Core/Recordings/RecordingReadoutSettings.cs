using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Recordings;

/// <summary>
/// Settings of the read-outs from recorded sweeps. Every definition shared with the simulator's read-outs comes from
/// <see cref="ReadoutSettings"/> (threshold criterion, passive deflection, adaptation multiple, class line) and
/// <see cref="SimulationSettings.Spikes"/> (spike detection); the rest only recordings need.
/// </summary>
public sealed record RecordingReadoutSettings
{
    public ReadoutSettings Shared { get; init; } = ReadoutSettings.Default;
    /// <summary>Steady state of a step: mean over its last 20 ms (as the simulator's input resistance).</summary>
    public double SteadyStateWindowMs { get; init; } = 20;
    /// <summary>Steady state for sag: mean over the step's last 50 ms (as the simulator's sag).</summary>
    public double SagSteadyWindowMs { get; init; } = 50;
    /// <summary>Baseline of a sweep: mean over up to this long before the step (ms).</summary>
    public double BaselineWindowMs { get; init; } = 50;
    /// <summary>
    /// Hyperpolarising sweeps whose steady deflection is at most this (mV) count as small for input resistance (little
    /// sag or rectification).
    /// </summary>
    public double SmallDeflectionMv { get; init; } = 10;
    /// <summary>
    /// Smoothing aims for a noise of at most this (mV/ms, rms) on the sample-to-sample slope: a fifth of the 20 mV/ms
    /// threshold criterion, so the criterion's crossing is not set by noise (our setting).
    /// </summary>
    public double SlopeNoiseTargetMvPerMs { get; init; } = 4;
    /// <summary>Longest smoothing window (ms): beyond it a spike's upstroke would be blurred (our setting).</summary>
    public double MaxSmoothingMs { get; init; } = 0.5;
    /// <summary>The trough of a sag response is tens of ms wide: it is taken from a 1 ms moving average, so noise does not deepen it.</summary>
    public double SagSmoothingMs { get; init; } = 1;

    public static RecordingReadoutSettings Default { get; } = new();
}
