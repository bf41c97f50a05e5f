using ExprModel.Core.Recordings;

namespace ExprModel.Core.Tests.Recordings;

/// <summary>
/// Analytic sweeps whose read-outs are known in closed form: a passive RC response to a step (textbook identity
/// V(t) = V0 + dV (1 - exp(-t / tau)) with dV = R I), and triangular spikes (linear rise and fall, so the half-width of
/// a linearly interpolated crossing is exact).
/// </summary>
internal static class SyntheticSweeps
{
    public const double RestMv = -65, OnsetMs = 100, StepMs = 500, TailMs = 100;

    /// <summary>Command current: holding 0, the step from <see cref="OnsetMs"/> for <see cref="StepMs"/>.</summary>
    public static double[] Command(double amplitudePa, double dtMs, double stepMs = StepMs)
    {
        int n = (int)Math.Round((OnsetMs + stepMs + TailMs) / dtMs);
        var i = new double[n];
        for (int k = 0; k < n; k++) { double t = k * dtMs; i[k] = t >= OnsetMs && t < OnsetMs + stepMs ? amplitudePa : 0; }
        return i;
    }

    /// <summary>RC charging to R x I during the step and relaxation after it (R in MOhm, I in pA: dV = R I / 1000 mV).</summary>
    public static double[] Passive(double amplitudePa, double rMOhm, double tauMs, double dtMs, double stepMs = StepMs, double restMv = RestMv)
    {
        int n = (int)Math.Round((OnsetMs + stepMs + TailMs) / dtMs);
        double dv = rMOhm * amplitudePa / 1000;
        var v = new double[n];
        double end = OnsetMs + stepMs;
        double atEnd = dv * (1 - Math.Exp(-stepMs / tauMs));
        for (int k = 0; k < n; k++)
        {
            double t = k * dtMs;
            v[k] = restMv + (t < OnsetMs ? 0 : t < end ? dv * (1 - Math.Exp(-(t - OnsetMs) / tauMs)) : atEnd * Math.Exp(-(t - end) / tauMs));
        }
        return v;
    }

    /// <summary>
    /// Triangular spikes from <paramref name="restMv"/>: rise at 200 mV/ms for 0.5 ms (to 100 mV above rest), fall at 100 mV/ms back
    /// over 1 ms; first at <paramref name="firstMs"/>, then every <paramref name="intervalMs"/> while the step lasts.
    /// Threshold = rest (the slope jumps from 0 to 200), amplitude 100 mV, half-width 0.25 + 0.5 = 0.75 ms.
    /// </summary>
    public static double[] Spiking(double firstMs, double? intervalMs, double dtMs, double stepMs = StepMs, double restMv = RestMv)
    {
        int n = (int)Math.Round((OnsetMs + stepMs + TailMs) / dtMs);
        var v = new double[n];
        for (int k = 0; k < n; k++)
        {
            double t = k * dtMs;
            v[k] = restMv;
            for (double s = firstMs; s < OnsetMs + stepMs; s += intervalMs ?? double.PositiveInfinity)
            {
                double x = t - s;
                if (x >= 0 && x <= 0.5) v[k] = restMv + 200 * x;
                else if (x > 0.5 && x <= 1.5) v[k] = restMv + 100 - 100 * (x - 0.5);
                if (intervalMs is null) break;
            }
        }
        return v;
    }

    public static RecordedSweep Sweep(int number, double dtMs, double[] v, double[] i) =>
        RecordedSweep.Create(number, dtMs, v, i, $"synthetic, sweep {number}");

    /// <summary>Seeded Gaussian noise (Box-Muller) of rms <paramref name="sdMv"/> added to a copy.</summary>
    public static double[] WithNoise(double[] v, double sdMv, Random rng)
    {
        var r = new double[v.Length];
        for (int k = 0; k < v.Length; k++)
        {
            double u1 = 1 - rng.NextDouble(), u2 = rng.NextDouble();
            r[k] = v[k] + sdMv * Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
        }
        return r;
    }

    /// <summary>
    /// A family at <paramref name="dtMs"/>: -20, -40, -80 pA passive (R = 200 MOhm, tau = 20 ms), +20 pA passive, +40 pA one
    /// spike 10 ms after onset, +80 pA spikes every 50 ms from onset + 5 ms.
    /// </summary>
    public static RecordedCell Family(double dtMs, Func<double[], double[]>? alter = null)
    {
        alter ??= v => v;
        var sweeps = new List<RecordedSweep>();
        int n = 1;
        foreach (var a in new[] { -20.0, -40, -80, 20 }) sweeps.Add(Sweep(n++, dtMs, alter(Passive(a, 200, 20, dtMs)), Command(a, dtMs)));
        sweeps.Add(Sweep(n++, dtMs, alter(Spiking(OnsetMs + 10, null, dtMs)), Command(40, dtMs)));
        sweeps.Add(Sweep(n++, dtMs, alter(Spiking(OnsetMs + 5, 50, dtMs)), Command(80, dtMs)));
        return new RecordedCell { CellId = "synthetic", Source = "synthetic", Sweeps = sweeps };
    }
}
