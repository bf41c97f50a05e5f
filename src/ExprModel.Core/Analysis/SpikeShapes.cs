namespace ExprModel.Core.Analysis;

/// <summary>Action-potential shape on a uniformly sampled trace.</summary>
public static class SpikeShapes
{
    /// <summary>
    /// Measures the spike whose upward detection crossing is at <paramref name="spikeTimeMs"/>. Threshold is the
    /// potential where dV/dt first exceeds <paramref name="thresholdSlopeMvPerMs"/> (20 mV/ms, common practice) before
    /// the peak; amplitude is peak minus threshold; half-width is the width at half amplitude; the after-
    /// hyperpolarisation is threshold minus the trough before the next spike (or within <paramref name="windowAfterMs"/>).
    /// </summary>
    public static SpikeShape? Measure(ReadOnlySpan<double> v, double dtMs, double startMs, double spikeTimeMs, double? nextSpikeMs,
        double thresholdSlopeMvPerMs = 20, double windowAfterMs = 100)
    {
        int n = v.Length;
        int cross = (int)Math.Round((spikeTimeMs - startMs) / dtMs);
        if (cross <= 1 || cross >= n - 2) return null;
        int peak = cross;
        int lookAhead = Math.Min(n - 1, cross + (int)(5 / dtMs));
        for (int i = cross; i <= lookAhead; i++) if (v[i] > v[peak]) peak = i;
        // Threshold: walk back from the crossing to where the slope falls below the criterion, at most 10 ms.
        int lookBack = Math.Max(1, cross - (int)(10 / dtMs));
        int th = -1;
        double maxRise = 0;
        for (int i = cross; i >= lookBack; i--)
        {
            double slope = (v[i] - v[i - 1]) / dtMs;
            maxRise = Math.Max(maxRise, slope);
            if (slope < thresholdSlopeMvPerMs) { th = i; break; }
        }
        for (int i = cross; i <= peak; i++) maxRise = Math.Max(maxRise, (v[i] - v[i - 1]) / dtMs);
        if (th < 0) th = lookBack;
        double threshold = v[th];
        double amplitude = v[peak] - threshold;
        double half = threshold + amplitude / 2;
        double up = double.NaN, down = double.NaN;
        for (int i = th; i < peak; i++)
            if (v[i] < half && v[i + 1] >= half) { up = (i + (half - v[i]) / (v[i + 1] - v[i])) * dtMs; break; }
        int end = nextSpikeMs is { } ns ? Math.Min(n - 1, (int)((ns - startMs) / dtMs) - 1) : Math.Min(n - 1, peak + (int)(windowAfterMs / dtMs));
        for (int i = peak; i < end; i++)
            if (v[i] >= half && v[i + 1] < half) { down = (i + (v[i] - half) / (v[i] - v[i + 1])) * dtMs; break; }
        double trough = double.PositiveInfinity;
        for (int i = peak; i <= end; i++) trough = Math.Min(trough, v[i]);
        if (double.IsInfinity(trough)) trough = v[peak];
        return new SpikeShape(threshold, v[peak], amplitude, down - up, threshold - trough, trough, maxRise);
    }
}
