using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// The first spike at rheobase: its shape (threshold, peak, amplitude, half-width, after-hyperpolarisation, maximal
/// rise rate) and its latency from step onset, and the check that it is a regenerative action potential.
/// </summary>
public static class SpikeAtRheobase
{
    /// <summary>
    /// How long past the first spike the rheobase step is recorded (ms): enough for the spike's shape, its
    /// after-hyperpolarisation window (<see cref="SpikeShapes.Measure"/>) and a following spike.
    /// </summary>
    public const double RecordPastSpikeMs = 150;

    /// <summary>
    /// Shape and latency of the first spike at or after step onset in one sampled response, recorded or simulated. The
    /// next spike, when there is one, bounds the after-hyperpolarisation window. Both are null without a spike in the
    /// step; the shape alone is null when the spike lies too near the trace's edge to measure.
    /// </summary>
    /// <param name="voltageMv">Membrane potential, one sample every <paramref name="dtMs"/>.</param>
    /// <param name="traceStartMs">Time of sample 0.</param>
    /// <param name="spikeTimesMs">Detection crossings of the trace, in time order (as <see cref="SpikeDetector"/> gives them).</param>
    /// <param name="stepOnsetMs">Step onset, on the same clock as the trace.</param>
    /// <param name="thresholdSlopeMvPerMs">dV/dt criterion for the voltage threshold (20 mV/ms, common practice).</param>
    public static (SpikeShape? Shape, double? LatencyMs) FirstSpike(ReadOnlySpan<double> voltageMv, double dtMs, double traceStartMs,
        IReadOnlyList<double> spikeTimesMs, double stepOnsetMs, double thresholdSlopeMvPerMs = 20)
    {
        var inStep = spikeTimesMs.Where(t => t >= stepOnsetMs).ToArray();
        if (inStep.Length == 0) return (null, null);
        var shape = SpikeShapes.Measure(voltageMv, dtMs, traceStartMs, inStep[0], inStep.Length > 1 ? inStep[1] : null, thresholdSlopeMvPerMs);
        return (shape, inStep[0] - stepOnsetMs);
    }

    /// <summary>
    /// A spike must be regenerative: its upstroke must outrun the passive charging rate of the step by a wide margin
    /// (three times, and at least the threshold criterion). Without this, a large step that merely pushes V past the
    /// detection level (a cell with its sodium switched off) would be given a rheobase.
    /// </summary>
    /// <param name="passiveChargingRateMvPerMs">Step current over membrane capacitance: uA/cm2 over uF/cm2, or pA over pF
    /// (both mV/ms).</param>
    public static bool IsRegenerative(SpikeShape? shape, double passiveChargingRateMvPerMs, double thresholdSlopeMvPerMs = 20) =>
        !(shape is null || shape.MaxRiseMvPerMs < Math.Max(thresholdSlopeMvPerMs, 3 * passiveChargingRateMvPerMs));

    /// <summary>
    /// Records the rheobase step and measures its first spike. The search saw when that spike comes: the step is
    /// recorded only up to <see cref="RecordPastSpikeMs"/> past it, starting from the search's resume point
    /// <see cref="Rheobase.ResumeMarginMs"/> before the spike when it kept one (near rheobase the first spike can come a
    /// second after onset). A response without a regenerative spike leaves the cell without a rheobase, with a note.
    /// </summary>
    internal static (double? RheobaseUaPerCm2, SpikeShape? Shape, double? LatencyMs) Measure(CompiledCell cell, ReadoutSettings s, CellState rest,
        double rheobaseUaPerCm2, RheobaseResult found, List<string> notes, CancellationToken cancel)
    {
        var sim = s.Simulation;
        double dt = sim.DtMs;
        double rb = rheobaseUaPerCm2;
        double onsetMs = Protocols.BaselineMs;
        double recordMs = found.LatencyMs is { } kl ? Math.Min(onsetMs + s.StepDurationMs, onsetMs + kl + RecordPastSpikeMs) : onsetMs + s.StepDurationMs;
        var step = Protocols.Step(rb, onsetMs, s.StepDurationMs);
        var recordAll = sim with { RecordEvery = 1 };
        var resume = found.BeforeFirstSpike;
        var at = resume is not null && resume.Step < (int)Math.Round(recordMs / dt) ? Simulator.Resume(cell, step, resume, recordMs, recordAll, cancel) : null;
        if (at is null || !at.SpikeTimesMs.Any(t => t >= onsetMs)) at = Simulator.Run(cell, step, recordMs, recordAll, rest, cancel);
        var (shape, latency) = FirstSpike(at.VoltageMv, dt, at.TimeMs[0], at.SpikeTimesMs, onsetMs, s.ThresholdSlopeMvPerMs);
        double chargingRate = rb / cell.Model.Geometry.CapacitanceUfPerCm2;
        if (IsRegenerative(shape, chargingRate, s.ThresholdSlopeMvPerMs)) return (rb, shape, latency);
        notes.Add($"Steps up to {rb:G3} uA/cm2 cross the detection level without a regenerative spike (upstroke no faster than passive " +
            "charging); no rheobase.");
        return (null, null, null);
    }
}
