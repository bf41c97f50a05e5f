using System.Numerics;
using ExprModel.Core.Simulation;
using MathNet.Numerics.LinearAlgebra;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Linear stability of the steady state: the eigenvalues of the Jacobian of the full system at the fixed point
/// (computed with MathNet.Numerics). Rest loses stability where the largest real part crosses zero (a Hopf
/// bifurcation when the crossing eigenvalues are complex).
/// </summary>
public static class RestStability
{
    /// <summary>Fixed point for a constant current: the V where the steady-state membrane current equals it, nearest to <paramref name="nearMv"/>.</summary>
    public static double SteadyVoltage(CompiledCell cell, double currentUaPerCm2, double nearMv = -65)
    {
        double F(double v)
        {
            var s = cell.SteadyState(v);
            double sum = 0;
            for (int c = 0; c < cell.ChannelCount; c++) sum += cell.ChannelCurrent(c, v, s.Gates, s.CalciumMm);
            return sum - currentUaPerCm2;
        }
        double best = double.NaN;
        double prevV = -130, prevF = F(prevV);
        for (double v = -129.9; v <= 60; v += 0.1)
        {
            double f = F(v);
            if (Math.Sign(f) != Math.Sign(prevF))
            {
                double root = MathNet.Numerics.RootFinding.Brent.FindRoot(F, prevV, v, 1e-10, 200);
                if (double.IsNaN(best) || Math.Abs(root - nearMv) < Math.Abs(best - nearMv)) best = root;
            }
            prevV = v;
            prevF = f;
        }
        if (double.IsNaN(best)) throw new ModelException($"No steady state between -130 and +60 mV at {currentUaPerCm2} uA/cm2.");
        return best;
    }

    /// <summary>Eigenvalues (1/ms) of the Jacobian at the fixed point for a constant current (instantaneous gates are algebraic and left out).</summary>
    public static Complex[] Eigenvalues(CompiledCell cell, double currentUaPerCm2, double nearMv = -65)
    {
        double v = SteadyVoltage(cell, currentUaPerCm2, nearMv);
        var y0 = cell.Pack(cell.SteadyState(v));
        var dynamic = Enumerable.Range(0, y0.Length).Where(i => i == 0 || i > cell.GateCount || !cell.GateIsInstantaneous[i - 1]).ToArray();
        int n = dynamic.Length;
        var jac = Matrix<double>.Build.Dense(n, n);
        var plus = new double[y0.Length];
        var minus = new double[y0.Length];
        var fp = new double[y0.Length];
        var fm = new double[y0.Length];
        for (int col = 0; col < n; col++)
        {
            int j = dynamic[col];
            double h = 1e-6 * Math.Max(1, Math.Abs(y0[j]));
            y0.CopyTo(plus, 0);
            y0.CopyTo(minus, 0);
            plus[j] += h;
            minus[j] -= h;
            cell.Derivatives(plus, currentUaPerCm2, fp);
            cell.Derivatives(minus, currentUaPerCm2, fm);
            for (int row = 0; row < n; row++) jac[row, col] = (fp[dynamic[row]] - fm[dynamic[row]]) / (2 * h);
        }
        return jac.Evd().EigenValues.ToArray();
    }

    /// <summary>Largest real part of the eigenvalues at a constant current: negative means the fixed point is stable.</summary>
    public static double LeadingRealPart(CompiledCell cell, double currentUaPerCm2, double nearMv = -65) =>
        Eigenvalues(cell, currentUaPerCm2, nearMv).Max(e => e.Real);

    /// <summary>Current (uA/cm2) at which the fixed point loses stability, by bisection between a stable and an unstable current.</summary>
    public static double LossOfStabilityCurrent(CompiledCell cell, double stableUaPerCm2, double unstableUaPerCm2, double toleranceUaPerCm2 = 1e-4,
        double nearMv = -65)
    {
        if (LeadingRealPart(cell, stableUaPerCm2, nearMv) >= 0) throw new ArgumentException("The lower current does not give a stable fixed point.");
        if (LeadingRealPart(cell, unstableUaPerCm2, nearMv) < 0) throw new ArgumentException("The upper current does not give an unstable fixed point.");
        double lo = stableUaPerCm2, hi = unstableUaPerCm2;
        while (hi - lo > toleranceUaPerCm2)
        {
            double mid = 0.5 * (lo + hi);
            if (LeadingRealPart(cell, mid, nearMv) < 0) lo = mid; else hi = mid;
        }
        return 0.5 * (lo + hi);
    }
}
