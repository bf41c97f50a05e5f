namespace ExprModel.Core.Simulation;

/// <summary>
/// Per-gate tables of the exact exponential update for a fixed step: for frozen V,
/// x(t + dt) = x_inf + (x - x_inf) e^(-dt/tau) = decay * x + drive (Rush &amp; Larsen 1978, IEEE Trans Biomed Eng 25:389).
/// Stored interleaved [decay, drive] on a uniform voltage grid and interpolated linearly.
/// </summary>
internal sealed class RateTable
{
    public const double MinMv = -150;
    public const double MaxMv = 100;
    /// <summary>Grid spacing (mV). Interpolation error ~ h^2/8 |f''|, far below the integrator's own error at 0.01 mV.</summary>
    public const double ResolutionMv = 0.01;
    public readonly int Points;
    public readonly double[]?[] Data;
    /// <summary>For calcium gates: the per-step decay e^(-dt/tau) (tau is voltage-independent).</summary>
    public readonly double[] CalciumDecay;
    public readonly double DtMs;
    private double[]? _flat;

    /// <summary>Every voltage gate's table laid end to end (stride 2 * Points) for the SIMD sweep kernel; calcium gates are zero.</summary>
    public double[] Flat => _flat ??= BuildFlat();

    private double[] BuildFlat()
    {
        var flat = new double[Data.Length * 2 * Points];
        for (int g = 0; g < Data.Length; g++)
            if (Data[g] is { } t) Array.Copy(t, 0, flat, (long)g * 2 * Points, t.Length);
        return flat;
    }

    public RateTable(CompiledCell cell, double dtMs)
    {
        DtMs = dtMs;
        Points = (int)Math.Round((MaxMv - MinMv) / ResolutionMv) + 1;
        Data = new double[]?[cell.GateCount];
        CalciumDecay = new double[cell.GateCount];
        for (int g = 0; g < cell.GateCount; g++)
        {
            if (cell.GateIsCalcium[g])
            {
                CalciumDecay[g] = Math.Exp(-dtMs / cell.GateTimeConstantMs(g, 0));
                continue;
            }
            var t = new double[2 * Points];
            bool instant = cell.GateIsInstantaneous[g];
            for (int i = 0; i < Points; i++)
            {
                double v = MinMv + i * ResolutionMv;
                double inf = cell.GateSteadyState(g, v, cell.ShellRestMm);
                if (instant)
                {
                    t[2 * i] = 0;
                    t[2 * i + 1] = inf;
                    continue;
                }
                double tau = cell.GateTimeConstantMs(g, v);
                if (!(tau > 0) || double.IsNaN(inf))
                    throw new ModelException($"{cell.GateLabel(g)}: time constant {tau} ms / steady state {inf} at {v:F2} mV is not usable; check the entry's rate parameters.");
                double e = Math.Exp(-dtMs / tau);
                t[2 * i] = e;
                t[2 * i + 1] = inf * (1 - e);
            }
            Data[g] = t;
        }
    }
}
