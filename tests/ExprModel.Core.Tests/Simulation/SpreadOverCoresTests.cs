using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>
/// A batch keeps every core busy with cells of its own, so each cell's sweeps and side runs stay on the cell's thread
/// (<see cref="Simulator.SpreadOverCores"/> false). Lanes never mix and the groups are the same either way, so every
/// number must be the same bit for bit as when the sweeps spread over the cores.
/// </summary>
public sealed class SpreadOverCoresTests
{
    [SimdFact]
    public void EveryGroupOfASweepRunsOnTheCallersThreadWhenItDoesNotSpread()
    {
        var cell = TestCatalog.Preset("cortex-rs2008");
        var rest = Simulator.Run(cell, new NoCurrent(), 300, SimulationSettings.SpikesOnly).FinalState;
        var threads = new System.Collections.Concurrent.ConcurrentBag<int>();
        // 32 lanes: eight SIMD groups of 1 s each (long enough for a spreading sweep to hand groups to other threads),
        // each sampling its own stimuli on the thread that runs it.
        var steps = Enumerable.Range(0, 32).Select(i => (Stimulus)new ThreadNotingStep(0.125 * i, threads)).ToArray();
        var spread = Simulator.Sweep(cell, steps, 1000, SimulationSettings.SpikesOnly, rest);
        threads.Clear();
        var alone = OnOneCore(() => Simulator.Sweep(cell, steps, 1000, SimulationSettings.SpikesOnly, rest));
        Assert.Equal(32, threads.Count);
        Assert.All(threads, t => Assert.Equal(Environment.CurrentManagedThreadId, t));
        Assert.True(spread.Sum(l => l.SpikeTimesMs.Count) > 0, "the larger steps spike");
        Assert.Equal(spread.Select(l => l.SpikeTimesMs), alone.Select(l => l.SpikeTimesMs));
        Assert.True(Simulator.SpreadOverCores, "the setting is restored for the rest of the test");
    }

    [SimdTheory]
    [InlineData("hh1952")]
    [InlineData("cortex-rs2008")]
    public void ReadoutsWithSagAreBitIdenticalOnOneCore(string preset)
    {
        var cell = TestCatalog.Preset(preset);
        var spread = Features.Measure(cell, ReadoutSettings.Live);
        var alone = OnOneCore(() => Features.Measure(cell, ReadoutSettings.Live));
        Assert.NotNull(spread.RheobaseUaPerCm2);
        Assert.Equal(spread.Rows().Select(r => r.Value), alone.Rows().Select(r => r.Value));
        Assert.Equal(spread.FiCurve.SelectMany(p => p.SpikeTimesMs), alone.FiCurve.SelectMany(p => p.SpikeTimesMs));
        Assert.Equal(spread.Notes, alone.Notes);
    }

    [Fact]
    public void ItemsThatFillTheCoresKeepTheirSweepsOnTheirOwnThreads()
    {
        int cores = Environment.ProcessorCount;
        var many = new bool[2 * cores];
        Simulator.ForEachItem(many.Length, default, i => many[i] = Simulator.SpreadOverCores);
        Assert.All(many, spread => Assert.False(spread));
        var few = new bool[2 * cores - 1];
        Simulator.ForEachItem(few.Length, default, i => few[i] = Simulator.SpreadOverCores);
        Assert.All(few, spread => Assert.True(spread));
        Assert.True(Simulator.SpreadOverCores, "the caller's setting is kept");
        // A caller that already keeps its sweeps on one thread keeps them there inside the items too.
        var nested = OnOneCore(() =>
        {
            var inner = new bool[1];
            Simulator.ForEachItem(1, default, i => inner[i] = Simulator.SpreadOverCores);
            return inner[0];
        });
        Assert.False(nested);
    }

    private static T OnOneCore<T>(Func<T> run)
    {
        Simulator.SpreadOverCores = false;
        try { return run(); }
        finally { Simulator.SpreadOverCores = true; }
    }

    /// <summary>A step from 100 ms that notes the thread sampling it (the SIMD kernel samples a group's stimuli where the group runs).</summary>
    private sealed record ThreadNotingStep(double AmplitudeUaPerCm2, System.Collections.Concurrent.ConcurrentBag<int> Threads) : Stimulus
    {
        public override double DensityAt(double tMs) => tMs >= 100 ? AmplitudeUaPerCm2 : 0;

        public override double[] Sample(double dtMs, int steps)
        {
            Threads.Add(Environment.CurrentManagedThreadId);
            return base.Sample(dtMs, steps);
        }
    }
}
