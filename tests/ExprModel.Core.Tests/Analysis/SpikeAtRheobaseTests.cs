using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>The spike at rheobase: a regenerative action potential, measured on the trace of the rheobase step.</summary>
public sealed class SpikeAtRheobaseTests
{
    [Fact]
    public void ACellWithoutSodiumHasNoRheobase()
    {
        // Without a regenerative inward current there is no action potential (Hodgkin & Huxley 1952), however far a
        // large step pushes V past the detection level.
        var doc = TestCatalog.Catalog.Preset("wb1996").WithRelativeDensities(new Dictionary<string, double> { ["wb-na-1996"] = 0 });
        var r = Features.Measure(new CompiledCell(TestCatalog.Catalog.BuildCell(doc)), ReadoutSettings.Live);
        Assert.Null(r.RheobaseUaPerCm2);
        Assert.Null(r.ThresholdMv);
        Assert.NotNull(r.InputResistanceMOhm);
    }

    [Fact]
    public void The_trace_measurement_gives_the_read_outs_own_spike_on_the_whole_rheobase_step()
    {
        // A recorded sweep is measured by the same code: the whole rheobase step, run from rest and recorded, gives the
        // read-outs' threshold, shape and latency. The read-outs record only from the search's resume point shortly
        // before the spike, kept by the SIMD sweep, so the two traces agree to rounding (DEVELOPERS.md: 1e-6 ms).
        var cell = TestCatalog.Preset("wb1996");
        var s = ReadoutSettings.Default;
        var r = Features.MeasureFirst(cell, s);
        double rb = r.RheobaseUaPerCm2!.Value;
        double onset = Protocols.BaselineMs;
        var run =
            Simulator.Run(cell, Protocols.Step(rb, onset, s.StepDurationMs), onset + s.StepDurationMs, s.Simulation with { RecordEvery = 1 }, r.RestState);
        var (shape, latency) = SpikeAtRheobase.FirstSpike(run.VoltageMv, s.Simulation.DtMs, run.TimeMs[0], run.SpikeTimesMs, onset, s.ThresholdSlopeMvPerMs);
        Assert.Equal(r.FirstSpikeLatencyMs!.Value, latency!.Value, 1e-6);
        Assert.Equal(r.ThresholdMv!.Value, shape!.ThresholdMv, 1e-6);
        Assert.Equal(r.PeakMv!.Value, shape.PeakMv, 1e-6);
        Assert.Equal(r.MaxRiseMvPerMs!.Value, shape.MaxRiseMvPerMs, 1e-4);
        Assert.True(SpikeAtRheobase.IsRegenerative(shape, rb / cell.Model.Geometry.CapacitanceUfPerCm2, s.ThresholdSlopeMvPerMs));
    }

    [Fact]
    public void A_step_with_no_spike_has_no_first_spike_and_is_not_regenerative()
    {
        var flat = new double[1000];
        Array.Fill(flat, -65.0);
        var (shape, latency) = SpikeAtRheobase.FirstSpike(flat, 0.025, 0, [], 5);
        Assert.Null(shape);
        Assert.Null(latency);
        Assert.False(SpikeAtRheobase.IsRegenerative(null, 0));
    }
}
