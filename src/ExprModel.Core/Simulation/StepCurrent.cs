namespace ExprModel.Core.Simulation;

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
