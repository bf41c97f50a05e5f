using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Finds the smallest step amplitude for which a property holds (a spike; sustained firing), assuming it holds
/// for every larger amplitude in the bracket. Each round tests several amplitudes in parallel (one lane per core)
/// and keeps the sub-interval that contains the onset: bisection generalised to k sections.
/// </summary>
public static class RheobaseSearch
{
    /// <summary>Result of an onset search: the largest amplitude without and the smallest with the property.</summary>
    public sealed record Bracket(double BelowUaPerCm2, double AtOrAboveUaPerCm2, double ToleranceUaPerCm2);

    /// <summary>Amplitudes tested per round: two SIMD groups of four per core keeps every core busy.</summary>
    private static int ProbesPerRound => Math.Max(4, 4 * Environment.ProcessorCount) - 1 + 1;

    public static Bracket? FindOnset(Func<IReadOnlyList<double>, bool[]> holds, double startUaPerCm2, double maxUaPerCm2,
        double absoluteTolerance, double relativeTolerance, CancellationToken cancel = default, (double Below, double Above)? known = null)
    {
        // Grow geometrically until the property holds (unless a bracket is already known).
        double lo = 0, hi = Math.Max(startUaPerCm2, 1e-4);
        if (known is { } k)
        {
            lo = k.Below;
            hi = k.Above;
        }
        while (known is null)
        {
            cancel.ThrowIfCancellationRequested();
            var probes = Enumerable.Range(0, ProbesPerRound).Select(k => hi * Math.Pow(1.3, k)).Where(x => x <= maxUaPerCm2 * 1.000001).ToArray();
            if (probes.Length == 0) return null;
            var ok = holds(probes);
            int first = Array.IndexOf(ok, true);
            if (first >= 0)
            {
                hi = probes[first];
                lo = first == 0 ? lo : probes[first - 1];
                break;
            }
            lo = probes[^1];
            hi = probes[^1] * 1.3;
            if (lo >= maxUaPerCm2) return null;
            hi = Math.Min(hi, maxUaPerCm2);
        }
        int lanes = ProbesPerRound;
        while (hi - lo > Math.Max(absoluteTolerance, relativeTolerance * hi))
        {
            cancel.ThrowIfCancellationRequested();
            var probes = Enumerable.Range(1, lanes).Select(i => lo + (hi - lo) * i / (lanes + 1)).ToArray();
            var ok = holds(probes);
            int first = Array.IndexOf(ok, true);
            double newLo = first < 0 ? probes[^1] : first == 0 ? lo : probes[first - 1];
            double newHi = first < 0 ? hi : probes[first];
            lo = newLo;
            hi = newHi;
        }
        return new Bracket(lo, hi, Math.Max(absoluteTolerance, relativeTolerance * hi));
    }

    /// <summary>
    /// Rheobase: the smallest step that evokes at least one spike. Also returns the first spike time (ms from step
    /// onset) at that amplitude, so the spike-shape run can stop soon after it.
    /// </summary>
    public static (Bracket? Bracket, double? LatencyMs) Rheobase(CompiledCell cell, CellState rest, double startUaPerCm2, double maxUaPerCm2, ReadoutSettings s, CancellationToken cancel = default)
    {
        var latency = new Dictionary<double, double>();
        var bracket = FindOnset(amps =>
        {
            // Only "any spike in the step" matters here, so each run may end at its first spike.
            var fi = FiCurve.Measure(cell, amps, s.StepDurationMs, rest, s.Simulation with { StopAtFirstSpikeAfterMs = FiCurve.DefaultDelayMs }, cancel);
            foreach (var p in fi) if (p.FirstSpikeLatencyMs is { } l) latency[p.CurrentUaPerCm2] = l;
            return fi.Select(p => p.SpikesInStep > 0).ToArray();
        }, startUaPerCm2, maxUaPerCm2, s.RheobaseAbsoluteToleranceUaPerCm2, s.RheobaseRelativeTolerance, cancel);
        return (bracket, bracket is not null && latency.TryGetValue(bracket.AtOrAboveUaPerCm2, out var t) ? t : null);
    }
}
