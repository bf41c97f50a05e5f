using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>The SIMD sweep must give the scalar loop's spikes (same scheme; only rounding may differ).</summary>
[Collection("simd-switch")]
public class SweepKernelTests
{
    [Theory]
    [InlineData("hh1952", 19.375)]
    [InlineData("wb1996", 2.0)]
    [InlineData("cortex-rs2008", 4.0)]
    public void SimdSweepMatchesScalarLoop(string preset, double to)
    {
        var cell = TestCatalog.Preset(preset);
        var amps = Enumerable.Range(0, 7).Select(i => to * i / 6).ToArray();
        IReadOnlyList<FiPoint> simd, scalar;
        try
        {
            Simulator.UseSimd = true;
            simd = FiCurve.Measure(cell, amps, 1000);
            Simulator.UseSimd = false;
            scalar = FiCurve.Measure(cell, amps, 1000);
        }
        finally
        {
            Simulator.UseSimd = true;
        }
        Assert.True(scalar.Sum(p => p.SpikeCount) > 20);
        for (int i = 0; i < amps.Length; i++)
        {
            Assert.Equal(scalar[i].SpikeCount, simd[i].SpikeCount);
            for (int k = 0; k < scalar[i].SpikeTimesMs.Count; k++)
                Assert.Equal(scalar[i].SpikeTimesMs[k], simd[i].SpikeTimesMs[k], 1e-6);
        }
    }
}
