using ExprModel.Core.Simulation;

namespace ExprModel.Web.Simulation;

/// <summary>
/// TEMPORARY bridge until ExprModel.Core.Analysis (Features.Measure, FiCurve.Measure) lands on main: it only counts the
/// spikes the simulator reports, and is replaced by the library calls on the next merge.
/// </summary>
internal static class PendingScience
{
    public static IReadOnlyList<FiRow> FiCurve(CompiledCell cell, FiProtocol fi, CancellationToken cancel)
    {
        var amps = Enumerable.Range(0, fi.Steps).Select(i => fi.FromUaPerCm2 + (fi.ToUaPerCm2 - fi.FromUaPerCm2) * i / (fi.Steps - 1)).ToArray();
        var stimuli = amps.Select(a => (Stimulus)new StepCurrent(0, fi.DurationMs, a)).ToArray();
        var spikes = Simulator.SpikeTimes(cell, stimuli, fi.DurationMs, null, null, cancel);
        return amps.Select((a, i) => new FiRow(a, spikes[i].Count, spikes[i].Count * 1000.0 / fi.DurationMs, double.NaN, double.NaN)).ToArray();
    }

    public static IReadOnlyList<ReadoutRow> Readouts(CompiledCell cell, CancellationToken cancel)
    {
        var t = Simulator.Run(cell, new StepCurrent(100, 500, 10), 700, SimulationSettings.Default with { RecordEvery = 0 }, null, cancel);
        return [new ReadoutRow("Spike count at 10 uA/cm2 (library read-outs pending)", "spikes", t.SpikeTimesMs.Count)];
    }
}
