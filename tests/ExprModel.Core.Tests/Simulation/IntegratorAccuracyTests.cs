using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.OdeSolvers;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>
/// The fast staggered exponential integrator against slow accurate references: classic RK4 at 1 us (ours) and
/// MathNet.Numerics' fourth-order Runge-Kutta. Spike counts must be equal and spike times within 0.1 ms over a 1 s
/// step, at the step size each preset needs for that accuracy (the scheme is second order: error ~ dt^2).
/// </summary>
public class IntegratorAccuracyTests
{
    [Theory]
    [InlineData("hh1952", 10.0, 0.01)]
    [InlineData("wb1996", 1.0, 0.004)]
    [InlineData("cortex-rs2008", 2.0, 0.008)]
    [InlineData("cortex-fs2008", 3.0, 0.01)]
    public void FastIntegratorMatchesReferenceSpikeTimes(string preset, double amplitude, double dtMs)
    {
        var cell = TestCatalog.Preset(preset);
        var step = Protocols.Step(amplitude, 100, 1000);
        var reference = ReferenceIntegrator.Run(cell, step, 1100, 0.001, 0);
        var fast = Simulator.Run(cell, step, 1100, new SimulationSettings { DtMs = dtMs, RecordEvery = 0 });
        Assert.True(reference.SpikeTimesMs.Count >= 10, $"{preset}: only {reference.SpikeTimesMs.Count} spikes");
        Assert.Equal(reference.SpikeTimesMs.Count, fast.SpikeTimesMs.Count);
        double worst = reference.SpikeTimesMs.Zip(fast.SpikeTimesMs).Max(p => Math.Abs(p.First - p.Second));
        Assert.True(worst < 0.1, $"{preset}: worst spike-time difference {worst:F4} ms at dt {dtMs} ms");
    }

    [Fact]
    public void ReferenceAgreesWithMathNetRungeKutta()
    {
        var cell = TestCatalog.Preset("hh1952");
        const double amp = 10, duration = 200, dt = 0.002;
        int n = (int)(duration / dt);
        var y0 = Vector<double>.Build.DenseOfArray(cell.Pack(cell.InitialState()));
        var dy = new double[y0.Count];
        var states = RungeKutta.FourthOrder(y0, 0, duration, n + 1, (t, y) =>
        {
            cell.Derivatives(y.AsArray() ?? y.ToArray(), amp, dy);
            return Vector<double>.Build.DenseOfArray((double[])dy.Clone());
        });
        var v = states.Select(s => s[0]).ToArray();
        var mathNetSpikes = SpikeDetector.Detect(v, duration / n);
        var ours = ReferenceIntegrator.Run(cell, new StepCurrent(0, duration + 1, amp), duration, 0.001, 0);
        Assert.Equal(mathNetSpikes.Count, ours.SpikeTimesMs.Count);
        Assert.True(mathNetSpikes.Zip(ours.SpikeTimesMs).All(p => Math.Abs(p.First - p.Second) < 0.01));
        var fast = Simulator.Run(cell, new StepCurrent(0, duration + 1, amp), duration, new SimulationSettings { DtMs = 0.01, RecordEvery = 0 });
        Assert.True(mathNetSpikes.Zip(fast.SpikeTimesMs).All(p => Math.Abs(p.First - p.Second) < 0.1));
    }

    [Fact]
    public void BlowUpStopsWithTimeAndChannelInsteadOfNaN()
    {
        var model = TestCatalog.Catalog.Preset("hh1952").ToCellModel(TestCatalog.Catalog.Resolve);
        // A huge injected current drives V out of any physical range.
        var cell = new CompiledCell(model);
        var ex = Assert.Throws<SimulationBlowUpException>(() => Simulator.Run(cell, new StepCurrent(10, 100, 1e9), 50));
        Assert.InRange(ex.TimeMs, 10, 11);
        Assert.Contains("t = ", ex.Message);
        Assert.Contains("squid", ex.Channel);
    }
}
