using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Recordings;

/// <summary>
/// What one recorded sweep shows: its own baseline (so drift between sweeps does not enter any deflection), the noise on
/// that baseline and the smoothing it calls for, spikes, the step's steady state and the rates of the step (the
/// simulator's <see cref="FiCurve.Point"/>). A sweep that cannot serve the step read-outs says why in
/// <see cref="Excluded"/>.
/// </summary>
public sealed record SweepAnalysis
{
    public required RecordedSweep Sweep { get; init; }
    public RecordedStep? Step => Sweep.Step;
    public double AmplitudePa => Step?.AmplitudePa ?? 0;
    public required double BaselineMv { get; init; }
    public required double NoiseMv { get; init; }
    /// <summary>Moving-average window applied before spike detection and spike shape (ms; 0 when none).</summary>
    public required double SmoothingMs { get; init; }
    /// <summary>The voltage spikes and shapes are measured on: raw, or smoothed when the baseline is noisy.</summary>
    public required double[] MeasuredMv { get; init; }
    public required IReadOnlyList<double> SpikeTimesMs { get; init; }
    /// <summary>Spikes before the step (on a cell at rest).</summary>
    public int SpikesBeforeStep { get; init; }
    /// <summary>Mean over the step's last <see cref="RecordingReadoutSettings.SteadyStateWindowMs"/>, or null without a usable step.</summary>
    public double? SteadyMv { get; init; }
    public FiPoint? Rates { get; init; }
    /// <summary>Why the sweep is left out of the step read-outs, or null when it is used.</summary>
    public string? Excluded { get; init; }

    public double? DeflectionMv => SteadyMv - BaselineMv;
    public int OnsetIndex => Step is { } s ? (int)Math.Round(s.OnsetMs / Sweep.SampleIntervalMs) : 0;
    public int OffsetIndex => Step is { } s ? Math.Min(Sweep.VoltageMv.Length, (int)Math.Round(s.OffsetMs / Sweep.SampleIntervalMs)) : Sweep.VoltageMv.Length;

    public static SweepAnalysis Of(RecordedSweep sweep, RecordingReadoutSettings settings)
    {
        double dt = sweep.SampleIntervalMs;
        var v = sweep.VoltageMv;
        var step = sweep.Step;
        string? excluded = null;
        if (step is null) excluded = $"{sweep.Source}: {sweep.StepProblem ?? "no step"}; used for the resting potential only.";
        else if (sweep.CommandDurationMs is { } full)
            excluded = $"{sweep.Source}: the recording stops at {sweep.DurationMs:0.#} ms of a {full:0.#} ms command: an aborted sweep, left out.";
        else if (step.EndsWithRecording) excluded = $"{sweep.Source}: the step is still on at the last sample: its end is unknown, so the sweep is left out.";

        // Baseline: up to 50 ms before the step (or the whole sweep without one).
        int onset = step is null ? v.Length : (int)Math.Round(step.OnsetMs / dt);
        int baseFrom = Math.Max(0, onset - (int)Math.Round(settings.BaselineWindowMs / dt));
        if (excluded is null && onset - baseFrom < Math.Max(8, (int)(2 / dt))) excluded = $"{sweep.Source}: less than 2 ms before the step: no baseline, " +
            "left out.";
        var baseline = v.AsSpan(baseFrom, Math.Max(1, onset - baseFrom));
        double baselineMv = Mean(baseline);
        double noise = NoiseSmoothing.NoiseMv(baseline);
        int window = NoiseSmoothing.WindowSamples(noise, dt, settings.SlopeNoiseTargetMvPerMs, settings.MaxSmoothingMs);
        var measured = window > 1 ? NoiseSmoothing.MovingAverage(v, window) : v;
        var spikes = SpikeDetector.Detect(measured, dt, 0, settings.Shared.Simulation.Spikes);
        int before = spikes.Count(t => t < (step?.OnsetMs ?? double.PositiveInfinity));
        double? steady = null;
        FiPoint? rates = null;
        if (excluded is null && step is not null)
        {
            int off = (int)Math.Round(step.OffsetMs / dt);
            int from = Math.Max(onset, off - (int)Math.Round(settings.SteadyStateWindowMs / dt));
            steady = Mean(v.AsSpan(from, off - from));
            rates = FiCurve.Point(step.AmplitudePa, spikes, step.OnsetMs, step.DurationMs);
        }
        return new SweepAnalysis
        {
            Sweep = sweep,
            BaselineMv = baselineMv,
            NoiseMv = noise,
            SmoothingMs = window > 1 ? window * dt : 0,
            MeasuredMv = measured,
            SpikeTimesMs = spikes,
            SpikesBeforeStep = before,
            SteadyMv = steady,
            Rates = rates,
            Excluded = excluded,
        };
    }

    internal static double Mean(ReadOnlySpan<double> v)
    {
        if (v.IsEmpty) return double.NaN;
        double s = 0;
        foreach (var x in v) s += x;
        return s / v.Length;
    }
}
