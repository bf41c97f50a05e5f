using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Sag: how far the membrane recovers from its lowest point during a large hyperpolarising step, as a fraction of the
/// peak deflection (an h-current's signature; common practice).
/// </summary>
public static class Sag
{
    /// <summary>Length of the read-outs' sag step (ms).</summary>
    public const double StepMs = 1000;

    /// <summary>The last part of the step over which the steady potential is averaged (ms).</summary>
    public const double SteadyWindowMs = 50;

    /// <summary>
    /// Sag ratio of one sampled response to a hyperpolarising step, recorded or simulated:
    /// (steady V - lowest V) / (rest - lowest V), with the lowest V taken over the step and the steady V the mean over
    /// its last <see cref="SteadyWindowMs"/>; 0 when the step does not move the membrane below rest.
    /// </summary>
    /// <param name="voltageMv">Membrane potential, one sample every <paramref name="dtMs"/>, sample 0 at time 0; it must
    /// cover the whole step.</param>
    /// <param name="stepOnsetMs">Step onset, from the start of the trace.</param>
    /// <param name="restMv">Potential before the step.</param>
    public static double Ratio(ReadOnlySpan<double> voltageMv, double dtMs, double stepOnsetMs, double stepDurationMs, double restMv)
    {
        int bOn = (int)Math.Round(stepOnsetMs / dtMs), bEnd = (int)Math.Round((stepOnsetMs + stepDurationMs) / dtMs);
        double vMin = double.PositiveInfinity;
        for (int i = bOn; i < bEnd; i++) vMin = Math.Min(vMin, voltageMv[i]);
        double vSs = Passive.MeanVoltage(voltageMv, bEnd - (int)(SteadyWindowMs / dtMs), bEnd);
        double peakDefl = restMv - vMin;
        return peakDefl > 1e-9 ? Math.Max(0, (vSs - vMin) / peakDefl) : 0;
    }

    /// <summary>
    /// The read-outs' sag step from rest, sized for <see cref="ReadoutSettings.SagDeflectionMv"/> on a passive membrane
    /// with the given slope conductance.
    /// </summary>
    internal static double Measure(CompiledCell cell, ReadoutSettings s, CellState rest, double slopeConductanceMsPerCm2, CancellationToken cancel)
    {
        var sim = s.Simulation;
        double iSag = s.SagDeflectionMv * slopeConductanceMsPerCm2;
        double onsetMs = Protocols.BaselineMs;
        var big = Simulator.Run(cell, Protocols.Step(iSag, onsetMs, StepMs), onsetMs + StepMs, sim with { RecordEvery = 1 }, rest, cancel);
        return Ratio(big.VoltageMv, sim.DtMs, onsetMs, StepMs, rest.VoltageMv);
    }
}
