using System.Globalization;
using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Simulation;

/// <summary>
/// Runs a protocol of the Workbench's protocols area on a compiled cell with the library's stimuli and analyses
/// (<see cref="Protocols"/>, <see cref="PulseThreshold"/>, <see cref="ClampFamilies"/>) and shapes the result for the page:
/// the CSV comes from the library's writers (<see cref="TraceCsv"/>, <see cref="ClampCsv"/>), as on the command line.
/// </summary>
public static class ProtocolRuns
{
    /// <summary>Time before a protocol's current starts and after it ends (ms), as the command line's simulate uses.</summary>
    public const double DelayMs = 100, AfterMs = 100;

    /// <summary>Every 4th integration step (0.1 ms) is kept in traces and CSV files, the command line's default.</summary>
    private static readonly SimulationSettings Recorded = SimulationSettings.Default with { RecordEvery = 4 };

    /// <exception cref="UserInputException">A protocol that cannot run, or a membrane that ran away (the message names the time).</exception>
    public static ProtocolOutcome Run(CompiledCell cell, string modelName, InjectedProtocol p, CancellationToken cancel)
    {
        try
        {
            return p.Kind switch
            {
                ProtocolForms.Pulse => Pulse(cell, modelName, V(p, "amplitude"), V(p, "width"), cancel),
                ProtocolForms.Clamp => Clamp(cell, modelName, p, cancel),
                _ => Injected(cell, modelName, p, cancel),
            };
        }
        catch (SimulationBlowUpException e) { throw new UserInputException(e.Message); }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
    }

    private static double V(InjectedProtocol p, string key) =>
        p.Values.TryGetValue(key, out var v) ? v : throw new UserInputException($"{ProtocolForms.LabelOf(p.Kind)}: the setting '{key}' is missing.");

    /// <summary>The stimulus and the simulated time of a current protocol.</summary>
    public static (Stimulus Stimulus, double TotalMs) Stimulus(InjectedProtocol p) => p.Kind switch
    {
        ProtocolForms.Train => (Protocols.Pulses(V(p, "amplitude"), (int)V(p, "count"), V(p, "width"), V(p, "frequency"), DelayMs),
            DelayMs + V(p, "count") * 1000 / V(p, "frequency") + AfterMs),
        ProtocolForms.Ramp => (Protocols.Ramp(V(p, "from"), V(p, "to"), V(p, "duration"), DelayMs), DelayMs + V(p, "duration") + AfterMs),
        ProtocolForms.Noise => (Protocols.Noise(V(p, "mean"), V(p, "sd"), V(p, "tau"), V(p, "duration"), (int)V(p, "seed"), DelayMs),
            DelayMs + V(p, "duration") + AfterMs),
        ProtocolForms.Waveform when p.WaveformTimesMs is { Length: >= 2 } t && p.WaveformUaPerCm2 is { } i && i.Length == t.Length =>
            (new WaveformCurrent(t, i), t[^1] + AfterMs),
        ProtocolForms.Waveform => throw new UserInputException("Your waveform: upload a file of time (ms) and current first."),
        _ => throw new UserInputException($"protocol: unknown kind '{p.Kind}'."),
    };

    private static ProtocolOutcome Injected(CompiledCell cell, string modelName, InjectedProtocol p, CancellationToken cancel)
    {
        var (stimulus, totalMs) = Stimulus(p);
        if (!(totalMs <= 10_000))
            throw new UserInputException($"{ProtocolForms.LabelOf(p.Kind)}: the run may last at most 10000 ms (this one {totalMs:0} ms).");
        var trace = Simulator.Run(cell, stimulus, totalMs, Recorded, null, cancel);
        var (t, v) = StepView.Thin(trace.TimeMs, trace.VoltageMv, ModelRunner.PlotBuckets);
        var (ts, s) = StepView.Thin(trace.TimeMs, trace.StimulusUaPerCm2, ModelRunner.PlotBuckets);
        int n = trace.SpikeTimesMs.Count;
        string summary = n == 0 ? "No spike." : FormattableString.Invariant($"{n} spike(s); the first at {trace.SpikeTimesMs[0]:0.#} ms.");
        return new ProtocolOutcome(summary,
        [
            new("protocol-voltage", "Membrane potential", "time (ms)", "V (mV)", [new("V", t, v)]),
            new("protocol-current", "Injected current", "time (ms)", "I (µA/cm²)", [new("I", ts, s)]),
        ], $"{p.Kind}-trace.csv", TraceCsv.Write(modelName, trace, CurrentUnit.UaPerCm2, cell.Model.Geometry));
    }

    private static ProtocolOutcome Pulse(CompiledCell cell, string modelName, double amplitude, double widthMs, CancellationToken cancel)
    {
        var (rest, firesAtRest) = PulseThreshold.SettledRest(cell, cancel: cancel);
        Trace Run(double a) => Simulator.Run(cell, PulseThreshold.Pulse(a, widthMs), PulseThreshold.RunMs(widthMs), Recorded, rest, cancel);
        var yours = Run(amplitude);
        bool spike = yours.SpikeTimesMs.Any(x => x >= PulseThreshold.DelayMs);
        var lines = new List<ProtocolSeries> { new(F($"your pulse, {amplitude:0.###} µA/cm²"), yours.TimeMs, yours.VoltageMv) };
        string summary = (spike ? "Spike." : "No spike.") + F($" A {widthMs:0.###} ms pulse of {amplitude:0.###} µA/cm² from the settled rest.");
        var comments = new List<string> { F($"pulse: {amplitude:R} uA/cm2 for {widthMs:R} ms, {(spike ? "spike" : "no spike")}") };
        if (firesAtRest) summary += " The cell fires without input, so the pulse threshold is not defined.";
        else if (PulseThreshold.Find(cell, rest, widthMs, cancel: cancel) is { } found)
        {
            var at = Run(found.ThresholdUaPerCm2);
            var below = Run(found.BelowUaPerCm2);
            lines.Add(new(F($"threshold, {found.ThresholdUaPerCm2:0.###} µA/cm²"), at.TimeMs, at.VoltageMv));
            lines.Add(new(F($"just below, {found.BelowUaPerCm2:0.###} µA/cm²"), below.TimeMs, below.VoltageMv));
            double pa = cell.Model.Geometry.DensityToPicoamps(found.ThresholdUaPerCm2);
            summary += F($" Pulse threshold {found.ThresholdUaPerCm2:0.###} µA/cm² ({pa:0} pA; charge {found.ChargeNcPerCm2:0.###} nC/cm²), within 0.5 %.");
            comments.Add(F($"pulse threshold: {found.ThresholdUaPerCm2:R} uA/cm2 (no spike at {found.BelowUaPerCm2:R})"));
        }
        else summary += " No pulse up to 5000 µA/cm² evokes a spike.";
        return new ProtocolOutcome(summary, [new("protocol-voltage", "Membrane potential after a brief pulse", "time (ms)", "V (mV)", lines)],
            "pulse-trace.csv", TraceCsv.Write(modelName, yours, CurrentUnit.UaPerCm2, cell.Model.Geometry, comments));
    }

    private static ProtocolOutcome Clamp(CompiledCell cell, string modelName, InjectedProtocol p, CancellationToken cancel)
    {
        var protocol = new ClampProtocol
        {
            HoldingMv = V(p, "holding"),
            FromMv = V(p, "from"),
            ToMv = V(p, "to"),
            IncrementMv = V(p, "increment"),
            CommandMs = V(p, "command"),
            ConditioningMs = V(p, "conditioning"),
            TestMv = V(p, "test"),
        };
        if (protocol.Problem() is { } problem) throw new UserInputException(problem);
        var curves = ClampFamilies.Measure(cell, protocol, cancel: cancel);
        var x = curves.CommandsMv;
        static double[] Values(double?[] y) => y.Select(v => v ?? double.NaN).ToArray();
        return new ProtocolOutcome(
            F($"{x.Length} commands from {protocol.FromMv:0.#} to {protocol.ToMv:0.#} mV, held at {protocol.HoldingMv:0.#} mV; ")
            + F($"inactivation tested at {protocol.TestMv:0.#} mV after {protocol.ConditioningMs:0} ms at each potential."),
        [
            new("clamp-iv", "I-V: peak current per channel", "command (mV)", "peak current (µA/cm²)",
                curves.Channels.Select(c => new ProtocolSeries(c, x, curves.PeakUaPerCm2[c])).ToArray()),
            new("clamp-activation", "Activation: normalised peak conductance", "command (mV)", "g / g max",
                curves.Channels.Select(c => new ProtocolSeries(c, x, Values(curves.Activation[c]))).ToArray()),
            new("clamp-inactivation", "Steady-state inactivation", "conditioning potential (mV)", "g / g max",
                curves.Channels.Select(c => new ProtocolSeries(c, x, Values(curves.Inactivation![c]))).ToArray()),
        ], "clamp-curves.csv", ClampCsv.Write(modelName, curves, CurrentUnit.UaPerCm2, cell.Model.Geometry));
    }

    private static string F(FormattableString s) => s.ToString(CultureInfo.InvariantCulture);
}
