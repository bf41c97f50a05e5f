using ExprModel.Core.Analysis;

namespace ExprModel.Core.Tests.Simulation;

public class NoisyCurrentTests
{
    /// <summary>
    /// The stationary Ornstein-Uhlenbeck process has the set mean and SD and the autocorrelation exp(-lag/tau)
    /// (Uhlenbeck and Ornstein 1930, Phys Rev 36:823; Gillespie 1996, Phys Rev E 54:2084). Over T = 100 s with
    /// tau = 5 ms the sample mean's standard error is SD sqrt(2 tau / T) = 0.01 SD; the tolerances are about five
    /// standard errors (common practice).
    /// </summary>
    [Theory]
    [InlineData(2.0, 1.5, 5.0, 1)]
    [InlineData(-1.0, 0.5, 5.0, 7)]
    public void Mean_sd_and_correlation_time_match_theory(double mean, double sd, double tauMs, int seed)
    {
        const double dtMs = 0.1, durationMs = 100_000;
        int steps = (int)(durationMs / dtMs);
        var x = Protocols.Noise(mean, sd, tauMs, durationMs, seed, delayMs: 0).Sample(dtMs, steps);
        // Drop the first 10 tau: the process starts at its mean, not from the stationary distribution's spread.
        var s = x.Skip((int)(10 * tauMs / dtMs)).ToArray();
        double m = s.Average();
        double var0 = s.Select(v => (v - m) * (v - m)).Average();
        Assert.InRange(m, mean - 0.05 * sd, mean + 0.05 * sd);
        Assert.InRange(Math.Sqrt(var0), 0.97 * sd, 1.03 * sd);
        foreach (double lagTau in new[] { 0.5, 1.0, 2.0 })
        {
            int lag = (int)Math.Round(lagTau * tauMs / dtMs);
            double c = 0;
            for (int i = 0; i + lag < s.Length; i++) c += (s[i] - m) * (s[i + lag] - m);
            double rho = c / (s.Length - lag) / var0;
            Assert.InRange(rho, Math.Exp(-lagTau) - 0.04, Math.Exp(-lagTau) + 0.04);
        }
        // The correlation time as the integral of the autocorrelation, summed out to 5 tau (where exp(-5) < 0.7 %).
        double integral = 0;
        for (int lag = 0; lag * dtMs < 5 * tauMs; lag++)
        {
            double c = 0;
            for (int i = 0; i + lag < s.Length; i += 7) c += (s[i] - m) * (s[i + lag] - m);
            integral += c / ((s.Length - lag + 6) / 7) / var0 * dtMs;
        }
        Assert.InRange(integral, 0.9 * tauMs * (1 - Math.Exp(-5)), 1.1 * tauMs);
    }

    [Fact]
    public void The_same_seed_gives_the_same_current_and_another_seed_another()
    {
        var a = Protocols.Noise(1, 1, 5, 100, 3).Sample(0.025, 8000);
        var b = Protocols.Noise(1, 1, 5, 100, 3).Sample(0.025, 8000);
        var c = Protocols.Noise(1, 1, 5, 100, 4).Sample(0.025, 8000);
        Assert.Equal(a, b);
        Assert.NotEqual(a, c);
        Assert.All(a.Take(3999), v => Assert.Equal(0, v)); // zero before the 100 ms delay
    }
}
