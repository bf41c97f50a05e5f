namespace ExprModel.Core.Simulation;

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
