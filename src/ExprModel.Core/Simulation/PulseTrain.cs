namespace ExprModel.Core.Simulation;

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
