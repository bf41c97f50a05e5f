using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>
/// Sweeps of steps start from a shared baseline (the zero-current stretch before the steps come on, computed once per
/// starting state). Lanes of the SIMD kernel are independent, so the read-outs must be the same bit for bit with and
/// without it, and must still meet the published properties of the presets.
/// </summary>
public sealed class SweepBaselinesTests
{
    [SimdTheory]
    [InlineData("hh1952")]
    [InlineData("wb1996")]
    [InlineData("cortex-rs2008")]
    [InlineData("cortex-fs2008")]
    public void BatchReadoutsAreBitIdenticalWithAndWithoutTheSharedBaseline(string preset)
    {
        var cell = TestCatalog.Preset(preset);
        var shared = Features.Measure(cell, ReadoutSettings.Batch);
        var alone = WithoutBaselines(() => Features.Measure(cell, ReadoutSettings.Batch));
        Assert.Equal(Values(alone), Values(shared));
        Assert.Equal(alone.FiCurve.Select(p => (p.CurrentUaPerCm2, p.SpikesInStep)), shared.FiCurve.Select(p => (p.CurrentUaPerCm2, p.SpikesInStep)));
        Assert.Equal(alone.FiCurve.SelectMany(p => p.SpikeTimesMs), shared.FiCurve.SelectMany(p => p.SpikeTimesMs));
        Assert.Equal(alone.Notes, shared.Notes);
    }

    [SimdFact]
    public void SweepFromTheBaselineKeepsSpikeTimesAndResumePoints()
    {
        var cell = TestCatalog.Preset("cortex-rs2008");
        var rest = Simulator.Run(cell, new NoCurrent(), 300, SimulationSettings.SpikesOnly).FinalState;
        var steps = new Stimulus[] { Protocols.Step(0), Protocols.Step(0.5), Protocols.Step(1.5), Protocols.Step(3), Protocols.Step(6) };
        var settings = SimulationSettings.SpikesOnly with { StopAtFirstSpikeAfterMs = FiCurve.DefaultDelayMs };
        var shared = Simulator.Sweep(cell, steps, 1120, settings, rest, Rheobase.ResumeMarginMs);
        var alone = WithoutBaselines(() => Simulator.Sweep(cell, steps, 1120, settings, rest, Rheobase.ResumeMarginMs));
        Assert.True(shared.Sum(l => l.SpikeTimesMs.Count) >= 3, "the larger steps spike");
        for (int i = 0; i < steps.Length; i++)
        {
            Assert.Equal(alone[i].SpikeTimesMs, shared[i].SpikeTimesMs);
            Assert.Equal(alone[i].BeforeFirstSpike?.Step, shared[i].BeforeFirstSpike?.Step);
            Assert.Equal(alone[i].BeforeFirstSpike?.State.Gates, shared[i].BeforeFirstSpike?.State.Gates);
            Assert.Equal(alone[i].BeforeFirstSpike?.State.VoltageMv, shared[i].BeforeFirstSpike?.State.VoltageMv);
        }
    }

    [SimdFact]
    public void SquidAxonBatchReadoutsStillMeetThePublishedOnset()
    {
        // Hodgkin & Huxley 1952 model at 6.3 C: repetitive firing is sustained only above about 6.26 uA/cm2 with a jump
        // to tens of Hz (Rinzel & Miller 1980, Math Biosci 49:27; Guckenheimer & Labouriau 1993, Bull Math Biol 55:937;
        // from memory). The batch settings judge the onset on 1 s steps to 5 %, so the band is that wide.
        var r = Features.Measure(TestCatalog.Preset("hh1952"), ReadoutSettings.Batch);
        Assert.Equal(2, r.ExcitabilityClass);
        Assert.InRange(r.SustainedFiringOnsetUaPerCm2!.Value, 6.26 / 1.06, 6.26 * 1.06);
        Assert.True(r.OnsetRateHz > 30, $"onset rate {r.OnsetRateHz} Hz");
    }

    [Fact]
    public void OnlyStepsWithoutHoldingCurrentThatComeOnLateShareABaseline()
    {
        var cell = TestCatalog.Preset("hh1952");
        var rest = Simulator.Run(cell, new NoCurrent(), 300, SimulationSettings.SpikesOnly).FinalState;
        var table = Simulator.TableFor(cell, 0.025);
        var s = SimulationSettings.SpikesOnly;
        if (SimdSupport.Missing is null) Assert.NotNull(SweepBaselines.For(cell, table, [Protocols.Step(5), new NoCurrent()], 44800, s, rest, default));
        Assert.Null(SweepBaselines.For(cell, table, [Protocols.Step(5), Protocols.Step(5, 2)], 44800, s, rest, default));
        Assert.Null(SweepBaselines.For(cell, table, [new StepCurrent(100, 1000, 5, HoldingUaPerCm2: -1)], 44800, s, rest, default));
        Assert.Null(SweepBaselines.For(cell, table, [Protocols.Ramp(0, 5, 1000)], 44800, s, rest, default));
    }

    private static T WithoutBaselines<T>(Func<T> run)
    {
        SweepBaselines.Enabled = false;
        try { return run(); }
        finally { SweepBaselines.Enabled = true; }
    }

    private static double?[] Values(CellReadouts r) => r.Rows().Select(x => x.Value).ToArray();
}
