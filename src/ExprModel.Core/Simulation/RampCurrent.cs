namespace ExprModel.Core.Simulation;

/// <summary>A linear ramp from <see cref="FromUaPerCm2"/> to <see cref="ToUaPerCm2"/>; zero outside.</summary>
public sealed record RampCurrent(double DelayMs, double DurationMs, double FromUaPerCm2, double ToUaPerCm2) : Stimulus
{
    public override double DensityAt(double tMs) =>
        tMs < DelayMs || tMs >= DelayMs + DurationMs ? 0 : FromUaPerCm2 + (ToUaPerCm2 - FromUaPerCm2) * (tMs - DelayMs) / DurationMs;
}
