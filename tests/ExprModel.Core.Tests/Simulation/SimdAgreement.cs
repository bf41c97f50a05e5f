using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>Runs the same step family through the SIMD sweep and the scalar loop and requires the same spikes.</summary>
public static class SimdAgreement
{
    /// <summary>Returns the scalar loop's points after asserting the SIMD sweep agrees (counts equal, times within 1e-6 ms).</summary>
    public static IReadOnlyList<FiPoint> Check(CompiledCell cell, IReadOnlyList<double> amplitudes, double durationMs, string label = "")
    {
        IReadOnlyList<FiPoint> simd, scalar;
        try
        {
            Simulator.UseSimd = true;
            simd = FiCurve.Measure(cell, amplitudes, durationMs);
            Simulator.UseSimd = false;
            scalar = FiCurve.Measure(cell, amplitudes, durationMs);
        }
        finally
        {
            Simulator.UseSimd = true;
        }
        for (int i = 0; i < amplitudes.Count; i++)
        {
            Assert.True(scalar[i].SpikesInStep == simd[i].SpikesInStep,
                $"{label} at {amplitudes[i]:G3} uA/cm2: scalar {scalar[i].SpikesInStep} spikes, SIMD {simd[i].SpikesInStep}");
            for (int k = 0; k < scalar[i].SpikeTimesMs.Count; k++)
                Assert.Equal(scalar[i].SpikeTimesMs[k], simd[i].SpikeTimesMs[k], 1e-6);
        }
        return scalar;
    }
}
