namespace ExprModel.Core.Simulation;

/// <summary>An arbitrary waveform given as (time ms, density) samples, linearly interpolated, zero outside.</summary>
public sealed record WaveformCurrent(IReadOnlyList<double> TimesMs, IReadOnlyList<double> DensitiesUaPerCm2) : Stimulus
{
    public override double DensityAt(double tMs)
    {
        var t = TimesMs;
        if (t.Count == 0 || tMs < t[0] || tMs > t[^1]) return 0;
        int lo = 0, hi = t.Count - 1;
        while (hi - lo > 1)
        {
            int mid = (lo + hi) / 2;
            if (t[mid] <= tMs) lo = mid; else hi = mid;
        }
        double span = t[hi] - t[lo];
        double f = span > 0 ? (tMs - t[lo]) / span : 0;
        return DensitiesUaPerCm2[lo] + f * (DensitiesUaPerCm2[hi] - DensitiesUaPerCm2[lo]);
    }
}
