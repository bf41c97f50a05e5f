using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Rheobase, the smallest step current that evokes a spike: an onset search (<see cref="OnsetSearch"/>) over runs of
/// the read-out step from rest, each ending at its first spike.
/// </summary>
public static class Rheobase
{
    /// <summary>Time before the first spike at which the search keeps a resume point for the spike-shape run (ms).</summary>
    public const double ResumeMarginMs = 20;

    /// <summary>
    /// Where the rheobase search starts (a step holding a passive membrane 5 mV above rest) and how far it goes (150 mV
    /// above rest, at most 200 uA/cm2), from the steady-state slope conductance at rest (mS/cm2). Beyond 150 mV the model
    /// leaves any physiological range; 200 uA/cm2 is 10 nA on 5000 um2.
    /// </summary>
    public static (double StartUaPerCm2, double MaxUaPerCm2) SearchRange(double slopeConductanceMsPerCm2) =>
        (slopeConductanceMsPerCm2 * 5, Math.Min(slopeConductanceMsPerCm2 * 150, 200));

    /// <summary>
    /// Rheobase: the smallest step that evokes at least one spike. Also returns the first spike time at that amplitude
    /// and a resume point shortly before that spike, so the spike-shape run need not simulate the whole latency again.
    /// </summary>
    public static RheobaseResult Search(CompiledCell cell, CellState rest, double startUaPerCm2, double maxUaPerCm2, ReadoutSettings s,
        CancellationToken cancel = default, double? hint = null)
    {
        var seen = new Dictionary<double, (double Latency, ResumePoint? Resume)>();
        double? outOfRange = null;
        double duration = FiCurve.DefaultDelayMs + s.StepDurationMs + 20;
        // Only "any spike in the step" matters here, so each run may end at its first spike.
        var settings = s.Simulation with { StopAtFirstSpikeAfterMs = FiCurve.DefaultDelayMs };
        IReadOnlyList<SweepLane?> Run(IReadOnlyList<double> amps) =>
            Simulator.Sweep(cell, amps.Select(a => (Stimulus)Protocols.Step(a, FiCurve.DefaultDelayMs, s.StepDurationMs)).ToArray(), duration, settings, rest,
                ResumeMarginMs, cancel);
        var bracket = OnsetSearch.FindOnset(amps =>
        {
            IReadOnlyList<SweepLane?> lanes;
            try
            {
                lanes = Run(amps);
            }
            catch (SimulationBlowUpException)
            {
                // A step the model cannot follow (the membrane runs past 1000 mV) stops its whole SIMD group: run the
                // round's steps one at a time to keep the others' answers, and count the runaway ones as no spike.
                lanes = amps.Select(a =>
                {
                    try { return Run([a])[0]; }
                    catch (SimulationBlowUpException) { outOfRange = Math.Min(outOfRange ?? double.PositiveInfinity, a); return null; }
                }).ToArray();
            }
            var holds = new bool[amps.Count];
            for (int i = 0; i < amps.Count; i++)
            {
                if (lanes[i] is not { } lane) continue;
                var p = FiCurve.Point(amps[i], lane.SpikeTimesMs, FiCurve.DefaultDelayMs, s.StepDurationMs);
                if (p.FirstSpikeLatencyMs is { } l) seen[amps[i]] = (l, lane.BeforeFirstSpike);
                holds[i] = p.SpikesInStep > 0;
            }
            return holds;
        }, startUaPerCm2, maxUaPerCm2, s.RheobaseAbsoluteToleranceUaPerCm2, s.RheobaseRelativeTolerance, cancel, hint: hint);
        return bracket is not null && seen.TryGetValue(bracket.AtOrAboveUaPerCm2, out var at)
            ? new RheobaseResult(bracket, at.Latency, at.Resume, outOfRange)
            : new RheobaseResult(bracket, null, null, outOfRange);
    }

    /// <summary>
    /// The read-outs' rheobase search from rest, with its notes (no spike in range, steps the model cannot follow,
    /// spiking that is not monotone in the amplitude) added to <paramref name="notes"/>. A seeded search that saw
    /// spiking stop and start again took a path of its own through the gap: it is run again unseeded, so the answer
    /// equals a cold measurement of the same cell.
    /// </summary>
    /// <returns>The search's result and, when any search saw it, the gap in spiking (lowest step seen to spike, a larger
    /// one seen not to).</returns>
    internal static (RheobaseResult Found, (double HeldUaPerCm2, double FailedAboveUaPerCm2)? NotMonotone) Measure(CompiledCell cell, CellState rest,
        double slopeConductanceMsPerCm2, ReadoutSettings s, RheobaseHint? hint, List<string> notes, CancellationToken cancel)
    {
        var (startSearch, maxSearch) = SearchRange(slopeConductanceMsPerCm2);
        var found = Search(cell, rest, startSearch, maxSearch, s, cancel, hint?.PredictFor(slopeConductanceMsPerCm2));
        var gap = found.Bracket?.NotMonotone;
        if (gap is not null && hint is not null) found = Search(cell, rest, startSearch, maxSearch, s, cancel);
        var (rheo, _, _, outOfRange) = found;
        if (rheo is null) notes.Add($"No spike for steps up to {maxSearch:G3} uA/cm2.");
        if (outOfRange is { } runaway)
            notes.Add($"The step of {runaway:G4} uA/cm2 drove the membrane past 1000 mV: the model has no stable response to it. " +
                "The rheobase search counts such steps as no spike.");
        var notMonotone = rheo?.NotMonotone ?? gap;
        if (notMonotone is { } nm)
            notes.Add($"Spiking is not monotone in the step amplitude here: the step of {nm.HeldUaPerCm2:G4} uA/cm2 crosses the spike detection level, " +
                $"the larger step of {nm.FailedAboveUaPerCm2:G4} uA/cm2 does not. The rheobase search assumes larger steps keep spiking; " +
                "it reports the lowest onset its probes found, and a smaller step may also spike.");
        return (found, notMonotone);
    }
}
