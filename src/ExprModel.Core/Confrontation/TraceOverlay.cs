using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Recordings;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Confrontation;

/// <summary>
/// A recorded sweep and the model's response to the same step on one time base: the model settles at the sweep's
/// holding current (<see cref="ReadoutSettings.SettleMs"/>, as every protocol starts), then receives the sweep's step
/// (pA to uA/cm2 through the model's area, <see cref="CurrentUnits"/>) at the same onset for the same duration; its
/// voltage is interpolated linearly onto the recording's sample times.
/// </summary>
public sealed record TraceOverlay
{
    public required string CellId { get; init; }
    public required int SweepNumber { get; init; }
    public required RecordedStep Step { get; init; }
    /// <summary>The step as the model receives it (uA/cm2), and the holding current likewise.</summary>
    public required double StepUaPerCm2 { get; init; }
    public required double HoldingUaPerCm2 { get; init; }
    public required double[] TimeMs { get; init; }
    public required double[] RecordedMv { get; init; }
    public required double[] PredictedMv { get; init; }
    public required double[] CommandPa { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];

    /// <summary>Simulates <paramref name="model"/> with a sweep's step and pairs it with the recording.</summary>
    /// <param name="sweepNumber">The sweep; null picks the recorded rheobase sweep (the smallest step with a
    /// regenerative spike), else the largest usable step.</param>
    /// <exception cref="ArgumentException">No such sweep, or a sweep without a usable step (the reason is named).</exception>
    /// <exception cref="SimulationBlowUpException">The model has no stable response to the step.</exception>
    public static TraceOverlay Of(RecordedCell cell, int? sweepNumber, CellModel model, ReadoutSettings? settings = null, CancellationToken cancel = default)
    {
        var s = settings ?? ReadoutSettings.Default;
        var sweep = sweepNumber is { } n
            ? cell.Sweeps.FirstOrDefault(w => w.SweepNumber == n) ?? throw new ArgumentException($"{cell.Source}: cell {cell.CellId} has no sweep {n} " +
                $"(sweeps: {string.Join(", ", cell.Sweeps.Select(w => w.SweepNumber))}).")
            : DefaultSweep(cell);
        var step = sweep.Step ?? throw new ArgumentException($"{sweep.Source}: {sweep.StepProblem ?? "no step"}; nothing to simulate.");
        var notes = new List<string>();
        if (sweep.CommandDurationMs is not null) notes.Add($"{sweep.Source}: the recording stops at {sweep.DurationMs:0.#} ms, before its command ends; the " +
            "model runs as long as the recording.");
        double stepDensity = CurrentUnits.ToDensity(step.AmplitudePa, CurrentUnit.Pa, model.Geometry);
        double holdingDensity = CurrentUnits.ToDensity(step.HoldingPa, CurrentUnit.Pa, model.Geometry);
        var compiled = new CompiledCell(model);
        var sim = s.Simulation;
        var rest = Simulator.Run(compiled, new StepCurrent(0, 0, 0, holdingDensity), s.SettleMs, sim with { RecordEvery = 0 }, null, cancel).FinalState;
        var trace = Simulator.Run(compiled, new StepCurrent(step.OnsetMs, step.DurationMs, stepDensity, holdingDensity), sweep.DurationMs,
            sim with { RecordEvery = 1 }, rest, cancel);
        int count = sweep.VoltageMv.Length;
        var time = new double[count];
        var predicted = new double[count];
        for (int i = 0; i < count; i++)
        {
            time[i] = i * sweep.SampleIntervalMs;
            predicted[i] = Interpolate(trace.TimeMs, trace.VoltageMv, time[i]);
        }
        double recordedBase = SweepAnalysis.Mean(sweep.VoltageMv.AsSpan(0, Math.Max(1, (int)(step.OnsetMs / sweep.SampleIntervalMs))));
        double predictedBase = SweepAnalysis.Mean(predicted.AsSpan(0, Math.Max(1, (int)(step.OnsetMs / sweep.SampleIntervalMs))));
        notes.Add(FormattableString.Invariant($"Baseline before the step: recorded {recordedBase:0.##} mV, model {predictedBase:0.##} mV (no offset is ") +
            "applied to either trace).");
        return new TraceOverlay
        {
            CellId = cell.CellId,
            SweepNumber = sweep.SweepNumber,
            Step = step,
            StepUaPerCm2 = stepDensity,
            HoldingUaPerCm2 = holdingDensity,
            TimeMs = time,
            RecordedMv = sweep.VoltageMv,
            PredictedMv = predicted,
            CommandPa = sweep.CurrentPa,
            Notes = notes,
        };
    }

    private static RecordedSweep DefaultSweep(RecordedCell cell)
    {
        var measured = RecordingFeatures.Measure(cell);
        var usable = measured.Sweeps.Where(w => w.Excluded is null && w.Step is not null).ToArray();
        if (usable.Length == 0) throw new ArgumentException($"{cell.Source}: cell {cell.CellId} has no sweep with a usable step.");
        var rheobase = measured.Readouts.RheobasePa is { } pa ? usable.FirstOrDefault(w => w.AmplitudePa == pa) : null;
        return (rheobase ?? usable.MaxBy(w => w.AmplitudePa)!).Sweep;
    }

    /// <summary>Linear interpolation on an increasing time grid; held constant beyond its ends.</summary>
    private static double Interpolate(double[] t, double[] v, double at)
    {
        int k = Array.BinarySearch(t, at);
        if (k >= 0) return v[k];
        k = ~k;
        if (k == 0) return v[0];
        if (k >= t.Length) return v[^1];
        double w = (at - t[k - 1]) / (t[k] - t[k - 1]);
        return v[k - 1] + w * (v[k] - v[k - 1]);
    }
}
