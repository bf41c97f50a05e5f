using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Brief current pulses from the settled rest: does one pulse evoke a spike, and the pulse threshold, the smallest
/// amplitude of a pulse of given width that does (the short-pulse counterpart of the rheobase; common practice).
/// </summary>
public static class PulseThreshold
{
    /// <summary>Time after the pulse's end in which a spike still counts as evoked by it (ms).</summary>
    public const double AfterMs = 50;

    /// <summary>The pulse starts this long after the settled rest (ms).</summary>
    public const double DelayMs = 20;

    /// <summary>The single pulse of <paramref name="amplitudeUaPerCm2"/> and <paramref name="widthMs"/>, starting after <see cref="DelayMs"/>.</summary>
    public static PulseTrain Pulse(double amplitudeUaPerCm2, double widthMs) => new(DelayMs, 1, widthMs, widthMs, amplitudeUaPerCm2);

    /// <summary>Length of a pulse run: delay, pulse, and the time after in which a spike counts (ms).</summary>
    public static double RunMs(double widthMs) => DelayMs + widthMs + AfterMs;

    /// <summary>
    /// The pulse threshold by k-section: a bracket found by doubling the amplitude from 0.5 uA/cm2 (up to
    /// <paramref name="maxUaPerCm2"/>) shrinks by probing four amplitudes per round as one SIMD group until its width is
    /// at most <paramref name="relativeTolerance"/> of its upper end. Spiking is assumed monotone in the amplitude.
    /// </summary>
    /// <param name="rest">The settled state the pulses start from (see <see cref="SettledRest"/>).</param>
    /// <returns>The bracket: the largest amplitude seen without a spike and the smallest seen with one; null when even
    /// <paramref name="maxUaPerCm2"/> evokes none.</returns>
    public static PulseThresholdResult? Find(CompiledCell cell, CellState rest, double widthMs, double relativeTolerance = 0.005,
        double maxUaPerCm2 = 5000, SimulationSettings? settings = null, CancellationToken cancel = default)
    {
        if (!(widthMs > 0) || !double.IsFinite(widthMs))
            throw new ArgumentOutOfRangeException(nameof(widthMs), "The pulse width must be a positive number of ms.");
        if (!(relativeTolerance > 0)) throw new ArgumentOutOfRangeException(nameof(relativeTolerance), "The tolerance must be positive.");
        settings = (settings ?? SimulationSettings.Default) with { RecordEvery = 0, StopAtFirstSpikeAfterMs = DelayMs };
        double lo = 0, hi = double.NaN;
        for (double a = 0.5; ; a *= 16)
        {
            var probe = new[] { a, 2 * a, 4 * a, 8 * a }.Select(x => Math.Min(x, maxUaPerCm2)).ToArray();
            var fires = Fires(cell, rest, probe, widthMs, settings, cancel);
            int first = Array.IndexOf(fires, true);
            if (first >= 0) { hi = probe[first]; if (first > 0) lo = probe[first - 1]; break; }
            lo = probe[^1];
            if (lo >= maxUaPerCm2) return null;
        }
        while (hi - lo > relativeTolerance * hi)
        {
            var probe = Enumerable.Range(1, 4).Select(k => lo + (hi - lo) * k / 5).ToArray();
            var fires = Fires(cell, rest, probe, widthMs, settings, cancel);
            int first = Array.IndexOf(fires, true);
            if (first >= 0) { hi = probe[first]; if (first > 0) lo = probe[first - 1]; }
            else lo = probe[^1];
        }
        return new PulseThresholdResult(widthMs, lo, hi);
    }

    /// <summary>The state after <see cref="ReadoutSettings.SettleMs"/> at zero current, and whether the cell fires at rest.</summary>
    public static (CellState State, bool FiresAtRest) SettledRest(CompiledCell cell, ReadoutSettings? settings = null, CancellationToken cancel = default) =>
        Rest.Settle(cell, settings ?? ReadoutSettings.Default, [], cancel);

    /// <summary>Spike or none after each pulse's onset, for pulses of the given amplitudes from <paramref name="rest"/>.</summary>
    public static bool[] Fires(CompiledCell cell, CellState rest, IReadOnlyList<double> amplitudesUaPerCm2, double widthMs,
        SimulationSettings? settings = null, CancellationToken cancel = default)
    {
        settings ??= SimulationSettings.Default with { RecordEvery = 0, StopAtFirstSpikeAfterMs = DelayMs };
        var stimuli = amplitudesUaPerCm2.Select(a => (Stimulus)Pulse(a, widthMs)).ToArray();
        var spikes = Simulator.SpikeTimes(cell, stimuli, RunMs(widthMs), settings, rest, cancel);
        return spikes.Select(s => s.Any(t => t >= DelayMs)).ToArray();
    }
}
