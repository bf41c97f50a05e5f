using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>
/// Resume points let the spike-shape run at rheobase start shortly before the first spike instead of at step onset.
/// The continued run must reproduce the run from the beginning: the integrator is deterministic, so only rounding
/// between the SIMD sweep and the scalar loop may differ (the same 1e-6 ms as <see cref="SimdAgreement"/>).
/// </summary>
public class ResumePointTests
{
    [SimdTheory]
    [InlineData("cortex-rs2008", 1.2)]  // first spike late in the step (slow ramp near rheobase)
    [InlineData("cortex-rs2008", 4.0)]
    [InlineData("wb1996", 0.5)]
    [InlineData("hh1952", 10.0)]
    public void Resumed_run_reproduces_the_whole_run_from_the_resume_point_on(string preset, double amplitude)
    {
        var cell = TestCatalog.Preset(preset);
        var rest = Simulator.Run(cell, new NoCurrent(), 500, SimulationSettings.SpikesOnly).FinalState;
        var step = Protocols.Step(amplitude, 100, 1000);
        var lane = Simulator.Sweep(cell, [step], 1120, SimulationSettings.SpikesOnly with { StopAtFirstSpikeAfterMs = 100 }, rest, 20)[0];
        Assert.NotEmpty(lane.SpikeTimesMs);
        var resume = lane.BeforeFirstSpike;
        Assert.NotNull(resume);
        double first = lane.SpikeTimesMs[0];
        Assert.InRange(first - resume.TimeMs, 20, 20 + 4 * SweepKernel.CheckpointEverySteps * 0.025);
        Assert.Equal(resume.Step * 0.025, resume.TimeMs, 1e-9);

        var whole = Simulator.Run(cell, step, first + 50, SimulationSettings.Default, rest);
        var resumed = Simulator.Resume(cell, step, resume, first + 50, SimulationSettings.Default);
        Assert.Equal(resume.TimeMs, resumed.TimeMs[0], 1e-9);
        Assert.Equal(whole.SpikeTimesMs.Count(t => t >= resume.TimeMs), resumed.SpikeTimesMs.Count);
        Assert.Equal(whole.SpikeTimesMs.First(t => t >= resume.TimeMs), resumed.SpikeTimesMs[0], 1e-6);
        // Sample by sample, the voltage after the resume point is the whole run's.
        int offset = resume.Step;
        for (int i = 0; i < resumed.VoltageMv.Length; i++)
            Assert.True(Math.Abs(whole.VoltageMv[offset + i] - resumed.VoltageMv[i]) < 1e-6,
                $"sample {i}: whole {whole.VoltageMv[offset + i]}, resumed {resumed.VoltageMv[i]}");
    }

    [SimdFact]
    public void No_resume_point_is_kept_unless_asked_for_or_when_no_spike_comes()
    {
        var cell = TestCatalog.Preset("wb1996");
        var rest = cell.InitialState();
        var lanes = Simulator.Sweep(cell, [Protocols.Step(0, 100, 500), Protocols.Step(3, 100, 500)], 620, SimulationSettings.SpikesOnly, rest, 20);
        Assert.Null(lanes[0].BeforeFirstSpike);
        Assert.NotNull(lanes[1].BeforeFirstSpike);
        Assert.All(Simulator.Sweep(cell, [Protocols.Step(3, 100, 500)], 620, SimulationSettings.SpikesOnly, rest), l => Assert.Null(l.BeforeFirstSpike));
    }

    [SimdFact]
    public void Spike_shape_at_rheobase_is_the_same_whether_or_not_the_search_kept_a_resume_point()
    {
        // The scalar loop keeps no resume points, so MeasureFirst records the rheobase step from onset there.
        var cell = TestCatalog.Preset("cortex-rs2008");
        var resumed = Features.MeasureFirst(cell, ReadoutSettings.Live);
        CellReadouts whole;
        try
        {
            Simulator.UseSimd = false;
            whole = Features.MeasureFirst(cell, ReadoutSettings.Live);
        }
        finally
        {
            Simulator.UseSimd = true;
        }
        Assert.Equal(whole.RheobaseUaPerCm2, resumed.RheobaseUaPerCm2);
        Assert.Equal(whole.FirstSpikeLatencyMs!.Value, resumed.FirstSpikeLatencyMs!.Value, 1e-6);
        Assert.Equal(whole.ThresholdMv!.Value, resumed.ThresholdMv!.Value, 1e-6);
        Assert.Equal(whole.PeakMv!.Value, resumed.PeakMv!.Value, 1e-6);
        Assert.Equal(whole.HalfWidthMs!.Value, resumed.HalfWidthMs!.Value, 1e-6);
        Assert.Equal(whole.AfterHyperpolarisationMv!.Value, resumed.AfterHyperpolarisationMv!.Value, 1e-6);
        Assert.Equal(whole.MaxRiseMvPerMs!.Value, resumed.MaxRiseMvPerMs!.Value, 1e-4);
    }
}
