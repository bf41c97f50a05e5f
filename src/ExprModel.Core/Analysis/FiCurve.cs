using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>Firing rate against step amplitude.</summary>
public static class FiCurve
{
    public const double DefaultDelayMs = Protocols.BaselineMs;

    /// <summary>
    /// The read-outs' f-I curve: <see cref="ReadoutSettings.FiSteps"/> equally spaced steps from 0 to
    /// <see cref="ReadoutSettings.FiMaxMultiple"/> x rheobase, with <see cref="ReadoutSettings.ExtraStepsUaPerCm2"/> riding
    /// along in the same sweep.
    /// </summary>
    internal static (IReadOnlyList<FiPoint> Curve, IReadOnlyList<FiPoint> ExtraSteps) MeasureToMultipleOfRheobase(CompiledCell cell, double rheobaseUaPerCm2,
        ReadoutSettings s, CellState rest, CancellationToken cancel)
    {
        var grid = Protocols.StepFamily(0, s.FiMaxMultiple * rheobaseUaPerCm2, s.FiSteps).Select(p => p.AmplitudeUaPerCm2).ToArray();
        var all = Measure(cell, [.. grid, .. s.ExtraStepsUaPerCm2], s.StepDurationMs, rest, s.Simulation, cancel);
        return (all.Take(grid.Length).ToArray(), all.Skip(grid.Length).ToArray());
    }

    /// <summary>Runs a family of steps (in parallel) and measures the rates of each.</summary>
    public static IReadOnlyList<FiPoint> Measure(CompiledCell cell, double fromUaPerCm2, double toUaPerCm2, int steps, double durationMs = 1000,
        CellState? initial = null, SimulationSettings? settings = null, CancellationToken cancel = default)
    {
        var family = Protocols.StepFamily(fromUaPerCm2, toUaPerCm2, steps, DefaultDelayMs, durationMs);
        return Measure(cell, family.Select(s => s.AmplitudeUaPerCm2).ToArray(), durationMs, initial, settings, cancel);
    }

    public static IReadOnlyList<FiPoint> Measure(CompiledCell cell, IReadOnlyList<double> amplitudesUaPerCm2, double durationMs = 1000,
        CellState? initial = null, SimulationSettings? settings = null, CancellationToken cancel = default)
    {
        var stimuli = amplitudesUaPerCm2.Select(a => (Stimulus)Protocols.Step(a, DefaultDelayMs, durationMs)).ToArray();
        var trains = Simulator.SpikeTimes(cell, stimuli, DefaultDelayMs + durationMs + 20, settings, initial, cancel);
        return amplitudesUaPerCm2.Select((a, i) => Point(a, trains[i], DefaultDelayMs, durationMs)).ToArray();
    }

    /// <summary>
    /// Rates of one step response from its spike times, recorded or simulated (times on the trace's clock; only those in
    /// the step count).
    /// </summary>
    public static FiPoint Point(double amplitude, IReadOnlyList<double> spikeTimesMs, double delayMs, double durationMs)
    {
        var inStep = spikeTimesMs.Where(t => t >= delayMs && t < delayMs + durationMs).ToArray();
        double whole = inStep.Length / (durationMs / 1000.0);
        double first = inStep.Length >= 2 ? 1000.0 / (inStep[1] - inStep[0]) : 0;
        var late = inStep.Where(t => t >= delayMs + durationMs / 2).ToArray();
        double lateRate = late.Length >= 2 ? 1000.0 * (late.Length - 1) / (late[^1] - late[0]) : 0;
        double? latency = inStep.Length > 0 ? inStep[0] - delayMs : null;
        return new FiPoint(amplitude, inStep.Length, whole, first, lateRate, latency) { SpikeTimesMs = inStep };
    }

    /// <summary>
    /// Gain: least-squares slope of whole-step rate against current over the points from the first firing one up to
    /// twice its current (Hz per uA/cm2); null with fewer than two such points. Uses MathNet's line fit.
    /// </summary>
    public static double? Gain(IReadOnlyList<FiPoint> curve)
    {
        var firing = curve.Where(p => p.SpikesInStep > 0).OrderBy(p => p.CurrentUaPerCm2).ToArray();
        if (firing.Length < 2) return null;
        double onset = firing[0].CurrentUaPerCm2;
        var used = firing.Where(p => p.CurrentUaPerCm2 <= Math.Max(2 * onset, firing[1].CurrentUaPerCm2)).ToArray();
        if (used.Length < 2) return null;
        var (_, slope) = MathNet.Numerics.Fit.Line(used.Select(p => p.CurrentUaPerCm2).ToArray(), used.Select(p => p.WholeStepRateHz).ToArray());
        return slope;
    }
}
