namespace ExprModel.Core.Recordings;

/// <summary>Noise estimate and the centred moving average used on noisy recorded voltage.</summary>
public static class NoiseSmoothing
{
    /// <summary>
    /// Rms noise (mV) of a stretch of baseline, from the median absolute first difference: for white noise of sd s the
    /// differences have sd s sqrt(2), and sd = 1.4826 x median absolute deviation for a normal distribution (common
    /// practice); the median ignores slow drift and the odd spike.
    /// </summary>
    public static double NoiseMv(ReadOnlySpan<double> baselineMv)
    {
        if (baselineMv.Length < 8) return 0;
        var d = new double[baselineMv.Length - 1];
        for (int i = 0; i < d.Length; i++) d[i] = Math.Abs(baselineMv[i + 1] - baselineMv[i]);
        Array.Sort(d);
        double median = d.Length % 2 == 1 ? d[d.Length / 2] : (d[d.Length / 2 - 1] + d[d.Length / 2]) / 2;
        return 1.4826 * median / Math.Sqrt(2);
    }

    /// <summary>
    /// Samples in the moving-average window that brings the slope noise down to <paramref name="slopeNoiseTargetMvPerMs"/>:
    /// the difference of two successive w-sample means has sd s sqrt(2) / w, a slope noise of s sqrt(2) / (w dt). Odd,
    /// and 1 (no smoothing) when the raw slope noise is already low enough.
    /// </summary>
    public static int WindowSamples(double noiseMv, double dtMs, double slopeNoiseTargetMvPerMs, double maxWindowMs)
    {
        double w = Math.Sqrt(2) * noiseMv / (slopeNoiseTargetMvPerMs * dtMs);
        if (w <= 1) return 1;
        int max = Math.Max(1, (int)(maxWindowMs / dtMs));
        int n = Math.Min(max, (int)Math.Ceiling(w));
        return n % 2 == 1 ? n : n + 1;
    }

    /// <summary>Centred moving average over <paramref name="window"/> samples (odd); the ends average what exists.</summary>
    public static double[] MovingAverage(ReadOnlySpan<double> v, int window)
    {
        var result = new double[v.Length];
        if (window <= 1) { v.CopyTo(result); return result; }
        int h = window / 2;
        double sum = 0;
        int lo = 0, hi = -1;
        for (int i = 0; i < v.Length; i++)
        {
            int wantHi = Math.Min(v.Length - 1, i + h), wantLo = Math.Max(0, i - h);
            while (hi < wantHi) sum += v[++hi];
            while (lo < wantLo) sum -= v[lo++];
            result[i] = sum / (hi - lo + 1);
        }
        return result;
    }
}
