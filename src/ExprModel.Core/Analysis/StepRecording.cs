using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// One current-clamp run recorded for viewing: the voltage trace of the whole run, and each channel's current density in
/// a window around the first spike (<see cref="WindowBeforeMs"/> before it to <see cref="WindowAfterMs"/> after).
/// </summary>
/// <remarks>
/// The whole run records voltage only, with a resume point every <see cref="SimulationSettings.ResumePointEverySteps"/>
/// steps. The window is then run again from the last resume point before it, recording gate states: the same scalar loop
/// from the same state gives the same numbers as recording gate states all along, at a fraction of the cost.
/// </remarks>
public sealed record StepRecording
{
    public const double WindowBeforeMs = 3, WindowAfterMs = 8;

    /// <summary>The whole run, every sample.</summary>
    public required Trace Trace { get; init; }

    /// <summary>Sample times of the window relative to the first spike (ms); empty when the run has no spike.</summary>
    public required double[] SpikeWindowMs { get; init; }

    /// <summary>Indices into <see cref="Trace"/>'s samples of <see cref="SpikeWindowMs"/>.</summary>
    public required int[] SpikeWindowSamples { get; init; }

    /// <summary>One label per channel, in the cell's order (<see cref="Simulator.ChannelLabels"/>).</summary>
    public required IReadOnlyList<string> ChannelLabels { get; init; }

    /// <summary>Per channel (same order as <see cref="ChannelLabels"/>), its current density (uA/cm2, outward positive) at each window sample.</summary>
    public required IReadOnlyList<double[]> SpikeWindowCurrentsUaPerCm2 { get; init; }

    /// <summary>Runs <paramref name="stimulus"/> for <paramref name="durationMs"/> from the model's initial state.</summary>
    /// <exception cref="SimulationBlowUpException">The membrane ran away (the message names the time).</exception>
    public static StepRecording Run(CompiledCell cell, Stimulus stimulus, double durationMs, CancellationToken cancel = default)
    {
        var settings = SimulationSettings.Default with { RecordEvery = 1, KeepResumePoints = true };
        var trace = Simulator.Run(cell, stimulus, durationMs, settings, null, cancel);
        var labels = Simulator.ChannelLabels(cell);
        if (trace.SpikeTimesMs.Count == 0 || trace.ResumePoints.Count == 0)
            return new StepRecording
            {
                Trace = trace,
                SpikeWindowMs = [],
                SpikeWindowSamples = [],
                ChannelLabels = labels,
                SpikeWindowCurrentsUaPerCm2 = labels.Select(_ => Array.Empty<double>()).ToArray()
            };

        double first = trace.SpikeTimesMs[0];
        var from = trace.ResumePoints.LastOrDefault(r => r.TimeMs <= first - WindowBeforeMs) ?? trace.ResumePoints[0];
        double until = Math.Min(trace.DurationMs, first + WindowAfterMs + 1);
        var window = Simulator.Resume(cell, stimulus, from, until, settings with { KeepResumePoints = false, RecordGateStates = true }, cancel);

        var t = trace.TimeMs;
        int lo = Math.Max(0, Index(t, first - WindowBeforeMs)), hi = Math.Min(t.Length - 1, Index(t, first + WindowAfterMs));
        var samples = Enumerable.Range(lo, hi - lo + 1).ToArray();
        // The rerun's samples are the trace's from the resume point's step on.
        int offset = (int)Math.Round(window.TimeMs[0] / trace.SampleIntervalMs);
        var rows = samples.Select(k => Simulator.ChannelCurrentsAt(cell, window, k - offset)).ToArray();
        return new StepRecording
        {
            Trace = trace,
            SpikeWindowMs = samples.Select(k => t[k] - first).ToArray(),
            SpikeWindowSamples = samples,
            ChannelLabels = labels,
            SpikeWindowCurrentsUaPerCm2 = Enumerable.Range(0, labels.Count).Select(c => rows.Select(r => r[c]).ToArray()).ToArray(),
        };
    }

    private static int Index(double[] t, double time)
    {
        int i = Array.BinarySearch(t, time);
        return i >= 0 ? i : ~i;
    }
}
