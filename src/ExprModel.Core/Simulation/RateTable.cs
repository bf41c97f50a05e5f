namespace ExprModel.Core.Simulation;

/// <summary>
/// Per-gate tables of the exact exponential update for a fixed step: for frozen V,
/// x(t + dt) = x_inf + (x - x_inf) e^(-dt/tau) = decay * x + drive (Rush &amp; Larsen 1978, IEEE Trans Biomed Eng 25:389).
/// Stored interleaved [decay, drive] on a uniform voltage grid and interpolated linearly.
/// </summary>
internal sealed unsafe class RateTable
{
    public const double MinMv = -150;
    public const double MaxMv = 100;
    /// <summary>Grid spacing (mV). Interpolation error ~ h^2/8 |f''|, far below the integrator's own error at 0.01 mV.</summary>
    public const double ResolutionMv = 0.01;
    public readonly int Points;
    public readonly double[]?[] Data;
    /// <summary>For calcium- and sodium-gated (Hill) gates: the per-step decay e^(-dt/tau) (tau is voltage-independent).</summary>
    public readonly double[] CalciumDecay;
    public readonly double DtMs;
    /// <summary>
    /// Address of each gate's pinned quad table (null pointer for calcium gates), for the SIMD kernel: per grid point
    /// [decay_i, drive_i, decay_(i+1) - decay_i, drive_(i+1) - drive_i], so one 32-byte load per lane brings everything
    /// the interpolation needs (four loads and a 4x4 transpose instead of four gathers).
    /// </summary>
    public unsafe double*[] QuadPointers()
    {
        var p = new double*[Data.Length];
        for (int g = 0; g < Data.Length; g++)
        {
            if (Data[g] is not { } t) continue;
            var q = Quads.GetOrAdd(t, MakeQuad);
            p[g] = (double*)System.Runtime.CompilerServices.Unsafe.AsPointer(ref System.Runtime.InteropServices.MemoryMarshal.GetArrayDataReference(q));
        }
        return p;
    }

    private static readonly System.Runtime.CompilerServices.ConditionalWeakTable<double[], double[]> Quads = new();

    private static double[] MakeQuad(double[] t)
    {
        int points = t.Length / 2;
        var q = GC.AllocateUninitializedArray<double>(4 * points, pinned: true);
        for (int i = 0; i < points; i++)
        {
            int n = Math.Min(i + 1, points - 1);
            q[4 * i] = t[2 * i];
            q[4 * i + 1] = t[2 * i + 1];
            q[4 * i + 2] = t[2 * n] - t[2 * i];
            q[4 * i + 3] = t[2 * n + 1] - t[2 * i + 1];
        }
        return q;
    }

    public RateTable(CellKinetics cell, double dtMs) : this(cell, dtMs, RateTableCache.Shared)
    {
    }

    /// <summary>The tables for <paramref name="cell"/> at step <paramref name="dtMs"/>, shared through <paramref name="cache"/>.</summary>
    public RateTable(CellKinetics cell, double dtMs, RateTableCache cache)
    {
        DtMs = dtMs;
        Points = (int)Math.Round((MaxMv - MinMv) / ResolutionMv) + 1;
        Data = new double[]?[cell.GateCount];
        CalciumDecay = new double[cell.GateCount];
        for (int g = 0; g < cell.GateCount; g++)
        {
            if (cell.GateIsConcentrationGated[g])
            {
                CalciumDecay[g] = Math.Exp(-dtMs / cell.GateTimeConstantMs(g, 0));
                continue;
            }
            // Tables depend only on the gate's kinetics, its voltage shift, its temperature factor and the step, not on
            // density: models built from the same entries (a batch over an atlas) share them (bounded store: RateTableCache).
            int points = Points;
            Data[g] = cache.GetOrBuild(cell, g, dtMs, points, () => Build(cell, g, dtMs, points));
        }
    }

    private static double[] Build(CellKinetics cell, int g, double dtMs, int points)
    {
        // Pinned (never moved by the GC), so the SIMD kernel can address tables by pointer without fixing them.
        var t = GC.AllocateUninitializedArray<double>(2 * points, pinned: true);
        bool instant = cell.GateIsInstantaneous[g];
        for (int i = 0; i < points; i++)
        {
            double v = MinMv + i * ResolutionMv;
            double inf = cell.GateSteadyState(g, v, cell.ShellRestMm, cell.SodiumShellRestMm);
            if (instant)
            {
                t[2 * i] = 0;
                t[2 * i + 1] = inf;
                continue;
            }
            double tau = cell.GateTimeConstantMs(g, v);
            if (!(tau > 0) || double.IsNaN(inf))
                throw new ModelException($"{cell.GateLabel(g)}: time constant {tau} ms / steady state {inf} at {v:F2} mV is not usable; " +
                    "check the entry's rate parameters.");
            double e = Math.Exp(-dtMs / tau);
            t[2 * i] = e;
            t[2 * i + 1] = inf * (1 - e);
        }
        return t;
    }
}
