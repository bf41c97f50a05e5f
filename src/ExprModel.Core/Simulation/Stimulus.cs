using System.Runtime.CompilerServices;

namespace ExprModel.Core.Simulation;

/// <summary>
/// An injected current as a function of time. Amplitudes are current densities (uA/cm2); convert absolute
/// currents with <see cref="Cell.Geometry.PicoampsToDensity"/>. Positive current depolarises.
/// </summary>
public abstract record Stimulus
{
    /// <summary>Current density (uA/cm2) at time <paramref name="tMs"/>.</summary>
    public abstract double DensityAt(double tMs);

    /// <summary>Samples the stimulus at the midpoint of each integration step (second-order with the staggered scheme).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public virtual double[] Sample(double dtMs, int steps)
    {
        var s = new double[steps];
        for (int i = 0; i < steps; i++) s[i] = DensityAt((i + 0.5) * dtMs);
        return s;
    }
}

/// <summary>No injected current.</summary>
public sealed record NoCurrent : Stimulus
{
    public override double DensityAt(double tMs) => 0;
}

/// <summary>A rectangular step of <see cref="AmplitudeUaPerCm2"/> from <see cref="DelayMs"/> for <see cref="DurationMs"/>.</summary>
public sealed record StepCurrent(double DelayMs, double DurationMs, double AmplitudeUaPerCm2, double HoldingUaPerCm2 = 0) : Stimulus
{
    public override double DensityAt(double tMs) => tMs >= DelayMs && tMs < DelayMs + DurationMs ? HoldingUaPerCm2 + AmplitudeUaPerCm2 : HoldingUaPerCm2;

    /// <summary>Same values as the midpoint rule of the base class, filled by range (sampling sits on the f-I hot path).</summary>
    public override double[] Sample(double dtMs, int steps)
    {
        var s = new double[steps];
        var (first, end) = OnRange(dtMs, steps);
        if (HoldingUaPerCm2 != 0) Array.Fill(s, HoldingUaPerCm2);
        if (end > first) Array.Fill(s, HoldingUaPerCm2 + AmplitudeUaPerCm2, first, end - first);
        return s;
    }

    /// <summary>The integration steps i (first inclusive, end exclusive) where DelayMs &lt;= (i + 0.5) dt &lt; DelayMs + DurationMs.</summary>
    public (int First, int End) OnRange(double dtMs, int steps)
    {
        int first = Math.Clamp((int)Math.Ceiling(DelayMs / dtMs - 0.5), 0, steps);
        int end = Math.Clamp((int)Math.Ceiling((DelayMs + DurationMs) / dtMs - 0.5), 0, steps);
        while (first > 0 && (first - 1 + 0.5) * dtMs >= DelayMs) first--;
        while (first < steps && (first + 0.5) * dtMs < DelayMs) first++;
        while (end > first && (end - 1 + 0.5) * dtMs >= DelayMs + DurationMs) end--;
        while (end < steps && (end + 0.5) * dtMs < DelayMs + DurationMs) end++;
        return (first, Math.Max(first, end));
    }
}

/// <summary>A linear ramp from <see cref="FromUaPerCm2"/> to <see cref="ToUaPerCm2"/>; zero outside.</summary>
public sealed record RampCurrent(double DelayMs, double DurationMs, double FromUaPerCm2, double ToUaPerCm2) : Stimulus
{
    public override double DensityAt(double tMs) =>
        tMs < DelayMs || tMs >= DelayMs + DurationMs ? 0 : FromUaPerCm2 + (ToUaPerCm2 - FromUaPerCm2) * (tMs - DelayMs) / DurationMs;
}

/// <summary>A train of <see cref="Count"/> rectangular pulses repeating every <see cref="IntervalMs"/>.</summary>
public sealed record PulseTrain(double DelayMs, int Count, double WidthMs, double IntervalMs, double AmplitudeUaPerCm2) : Stimulus
{
    public override double DensityAt(double tMs)
    {
        if (tMs < DelayMs) return 0;
        double rel = tMs - DelayMs;
        int k = (int)Math.Floor(rel / IntervalMs);
        if (k >= Count) return 0;
        return rel - k * IntervalMs < WidthMs ? AmplitudeUaPerCm2 : 0;
    }
}

/// <summary>
/// Ornstein-Uhlenbeck noisy current with mean, standard deviation and correlation time, seeded so a run is
/// reproducible. Uses the exact discrete update x' = mu + (x - mu) e^(-dt/tau) + sigma sqrt(1 - e^(-2dt/tau)) N(0,1)
/// (Gillespie 1996, Phys Rev E 54:2084).
/// </summary>
public sealed record NoisyCurrent(double DelayMs, double DurationMs, double MeanUaPerCm2, double SdUaPerCm2, double CorrelationMs, int Seed) : Stimulus
{
    public override double DensityAt(double tMs) =>
        throw new NotSupportedException("Noisy current is defined on the integration grid only; use Sample.");

    public override double[] Sample(double dtMs, int steps)
    {
        var s = new double[steps];
        var rng = new Random(Seed);
        double decay = Math.Exp(-dtMs / CorrelationMs);
        double kick = SdUaPerCm2 * Math.Sqrt(1 - decay * decay);
        double x = MeanUaPerCm2;
        for (int i = 0; i < steps; i++)
        {
            double t = (i + 0.5) * dtMs;
            if (t < DelayMs || t >= DelayMs + DurationMs) { s[i] = 0; continue; }
            // Box-Muller from two uniforms in (0, 1].
            double u1 = 1.0 - rng.NextDouble(), u2 = rng.NextDouble();
            double n = Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
            x = MeanUaPerCm2 + (x - MeanUaPerCm2) * decay + kick * n;
            s[i] = x;
        }
        return s;
    }
}

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

/// <summary>The sum of several stimuli (e.g. a holding current plus a step plus noise).</summary>
public sealed record SummedCurrent(IReadOnlyList<Stimulus> Parts) : Stimulus
{
    public override double DensityAt(double tMs) => Parts.Sum(p => p.DensityAt(tMs));

    public override double[] Sample(double dtMs, int steps)
    {
        var s = new double[steps];
        foreach (var p in Parts)
        {
            var q = p.Sample(dtMs, steps);
            for (int i = 0; i < steps; i++) s[i] += q[i];
        }
        return s;
    }
}
