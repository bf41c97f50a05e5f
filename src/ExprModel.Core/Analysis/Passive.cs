using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Passive read-outs from a small hyperpolarising step: input resistance (dV/dI at the end of the step) and membrane
/// time constant (the charging curve), and the slope conductance that sizes the step.
/// </summary>
public static class Passive
{
    /// <summary>The last part of the step over which the end potential is averaged (ms).</summary>
    public const double EndWindowMs = 20;

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

    /// <summary>
    /// Input resistance and time constant of one sampled response to a small step, recorded or simulated. The end
    /// potential is the mean over the last <see cref="EndWindowMs"/> of the step; both read-outs need a passive
    /// response, so when the membrane ends up moving against the current (a rest that is not stable) they are null.
    /// The caller checks first that the step evoked no spike.
    /// </summary>
    /// <param name="voltageMv">Membrane potential, one sample every <paramref name="dtMs"/>, sample 0 at time 0.</param>
    /// <param name="stepOnsetMs">Step onset, from the start of the trace.</param>
    /// <param name="restMv">Potential before the step.</param>
    /// <param name="stepCurrentNa">Step current (nA; negative for a hyperpolarising step).</param>
    /// <returns>The deflection at the end of the step (mV), input resistance (MOhm) and time constant (ms).</returns>
    public static (double DeflectionMv, double? InputResistanceMOhm, double? TimeConstantMs) StepResponse(ReadOnlySpan<double> voltageMv, double dtMs,
        double stepOnsetMs, double stepDurationMs, double restMv, double stepCurrentNa)
    {
        int onset = (int)Math.Round(stepOnsetMs / dtMs);
        int endIdx = (int)Math.Round((stepOnsetMs + stepDurationMs) / dtMs);
        double vEnd = MeanVoltage(voltageMv, endIdx - (int)(EndWindowMs / dtMs), endIdx);
        double dv = vEnd - restMv;
        if (!(dv * stepCurrentNa > 0)) return (dv, null, null);
        return (dv, dv / stepCurrentNa, TimeConstantMs(voltageMv, dtMs, onset, restMv, dv));
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

    /// <summary>
    /// The read-outs' small step from rest, sized for <see cref="ReadoutSettings.PassiveDeflectionMv"/> on a passive
    /// membrane with the given slope conductance; a note says why when the response is not passive.
    /// </summary>
    internal static (double? InputResistanceMOhm, double? TimeConstantMs, string? Note) MeasureStep(CompiledCell cell, ReadoutSettings s, CellState rest,
        double slopeConductanceMsPerCm2, CancellationToken cancel)
    {
        var sim = s.Simulation;
        double iSmall = s.PassiveDeflectionMv * slopeConductanceMsPerCm2;
        double passiveMs = s.PassiveStepMs;
        double onsetMs = Protocols.BaselineMs;
        var small = Simulator.Run(cell, Protocols.Step(iSmall, onsetMs, passiveMs), onsetMs + passiveMs, sim with { RecordEvery = 1, RecordCurrents = false },
            rest, cancel);
        bool spiked = small.SpikeTimesMs.Count > 0;
        var (dv, rin, tau) = spiked ? (double.NaN, null, null)
            : StepResponse(small.VoltageMv, sim.DtMs, onsetMs, passiveMs, rest.VoltageMv,
                CurrentUnits.FromDensity(iSmall, CurrentUnit.Na, cell.Model.Geometry));
        if (rin is not null) return (rin, tau, null);
        return (null, null, $"The small hyperpolarising step ({iSmall:G3} uA/cm2) did not give a passive response " +
            (spiked ? "(it evoked a spike)" : $"(V moved {dv:+0.###;-0.###} mV, against the current)") +
                "; input resistance and time constant are not defined.");
    }

    /// <summary>Mean of the samples in [from, to), clipped to the trace; NaN for an empty window.</summary>
    internal static double MeanVoltage(ReadOnlySpan<double> v, int from, int to)
    {
        from = Math.Max(0, from);
        to = Math.Min(v.Length, to);
        double s = 0;
        for (int i = from; i < to; i++) s += v[i];
        return to > from ? s / (to - from) : double.NaN;
    }
}
