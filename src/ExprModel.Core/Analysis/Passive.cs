using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>Passive read-outs from small and large hyperpolarising steps.</summary>
public static class Passive
{
    /// <summary>
    /// Slope conductance (mS/cm2) of the steady-state current-voltage relation at <paramref name="vMv"/>: the
    /// derivative of the sum of every channel's steady-state current, by central difference over +-0.5 mV.
    /// </summary>
    public static double SteadySlopeConductance(CompiledCell cell, double vMv)
    {
        double I(double v)
        {
            var s = cell.SteadyState(v);
            double sum = 0;
            for (int c = 0; c < cell.ChannelCount; c++) sum += cell.ChannelCurrent(c, v, s.Gates, s.CalciumMm);
            return sum;
        }
        return (I(vMv + 0.5) - I(vMv - 0.5)) / 1.0;
    }

    /// <summary>Membrane time constant (ms) by a MathNet line fit of ln(1 - dV/dV_end) over the 10-90% part of the response.</summary>
    public static double? TimeConstantMs(ReadOnlySpan<double> v, double dtMs, int onsetIndex, double restMv, double endDeflectionMv)
    {
        var ts = new List<double>();
        var ys = new List<double>();
        for (int i = onsetIndex + 1; i < v.Length; i++)
        {
            double frac = (v[i] - restMv) / endDeflectionMv;
            if (frac >= 0.9) break;
            if (frac > 0.1)
            {
                ts.Add((i - onsetIndex) * dtMs);
                ys.Add(Math.Log(1 - frac));
            }
        }
        if (ts.Count < 3) return null;
        var (_, slope) = MathNet.Numerics.Fit.Line(ts.ToArray(), ys.ToArray());
        return slope < 0 ? -1 / slope : null;
    }
}
