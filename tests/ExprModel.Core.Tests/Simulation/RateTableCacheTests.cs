using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>
/// The shared rate-table store keeps within its byte bound by dropping the least recently used tables, stays within it
/// when many threads fill it at once, and a table built again after it was dropped gives the same numbers and spikes.
/// </summary>
public sealed class RateTableCacheTests
{
    private const double DtMs = 0.025;

    /// <summary>The squid-axon preset (three tabulated gates: m, h, n) at another temperature: new temperature factors, new tables.</summary>
    private static CompiledCell SquidAxonAt(double temperatureC) =>
        new(TestCatalog.Preset("hh1952").Model with { TemperatureC = temperatureC });

    private static long TableBytes => RateTableCache.BytesPerTable(new RateTable(SquidAxonAt(6.3).Kinetics, DtMs, new RateTableCache(long.MaxValue)).Points);

    [Fact]
    public void Filling_past_the_bound_keeps_the_held_bytes_within_it()
    {
        var cache = new RateTableCache(5 * TableBytes);
        for (int i = 0; i < 10; i++) _ = new RateTable(SquidAxonAt(6.3 + i).Kinetics, DtMs, cache);
        // 10 temperatures x 3 gates = 30 distinct tables through a store that holds 5.
        Assert.Equal(5, cache.Count);
        Assert.Equal(5 * TableBytes, cache.HeldBytes);
        Assert.True(cache.HeldBytes <= cache.BoundBytes, $"held {cache.HeldBytes} bytes, bound {cache.BoundBytes}");
        Assert.Equal(25, cache.Evictions);
    }

    [Fact]
    public void The_least_recently_used_table_goes_first()
    {
        var cache = new RateTableCache(3 * TableBytes);
        var kinetics = SquidAxonAt(6.3).Kinetics;
        var a = new RateTable(kinetics, DtMs, cache); // m, h, n: the store is full
        int builds = 0;
        double[] Count()
        {
            builds++;
            return new double[2];
        }
        // Use m and n again, then add a fourth table: h, the least recently used, is dropped; m and n are not rebuilt.
        Assert.Same(a.Data[0], cache.GetOrBuild(kinetics, 0, DtMs, a.Points, Count));
        Assert.Same(a.Data[2], cache.GetOrBuild(kinetics, 2, DtMs, a.Points, Count));
        _ = cache.GetOrBuild(kinetics, 0, 0.05, a.Points, () => new double[2]);
        Assert.Equal(3, cache.Count);
        Assert.Same(a.Data[0], cache.GetOrBuild(kinetics, 0, DtMs, a.Points, Count));
        Assert.Same(a.Data[2], cache.GetOrBuild(kinetics, 2, DtMs, a.Points, Count));
        Assert.Equal(0, builds);
        Assert.NotSame(a.Data[1], cache.GetOrBuild(kinetics, 1, DtMs, a.Points, Count));
        Assert.Equal(1, builds);
    }

    [Fact]
    public void Many_threads_filling_the_store_at_once_leave_it_within_the_bound()
    {
        var cache = new RateTableCache(4 * TableBytes);
        var cells = Enumerable.Range(0, 12).Select(i => SquidAxonAt(10 + 0.5 * i).Kinetics).ToArray();
        Parallel.For(0, 48, new ParallelOptions { MaxDegreeOfParallelism = 4 }, i => _ = new RateTable(cells[i % cells.Length], DtMs, cache));
        Assert.True(cache.HeldBytes <= cache.BoundBytes, $"held {cache.HeldBytes} bytes, bound {cache.BoundBytes}");
        Assert.Equal(cache.Count * TableBytes, cache.HeldBytes);
        Assert.True(cache.Evictions >= 36 - 4, $"{cache.Evictions} evictions for 36 distinct tables in a store of 4");
    }

    [Fact]
    public void A_table_built_again_after_eviction_gives_identical_numbers_and_spikes()
    {
        var cache = new RateTableCache(3 * TableBytes);
        var cell = SquidAxonAt(6.3);
        var before = new RateTable(cell.Kinetics, DtMs, cache);
        for (int i = 1; i <= 3; i++) _ = new RateTable(SquidAxonAt(6.3 + i).Kinetics, DtMs, cache);
        var after = new RateTable(cell.Kinetics, DtMs, cache);
        for (int g = 0; g < 3; g++)
        {
            Assert.NotSame(before.Data[g], after.Data[g]);
            Assert.Equal(before.Data[g], after.Data[g]);
        }
        // The squid-axon model fires repetitively at 10 uA/cm2 (above the 6.26 uA/cm2 onset of sustained firing,
        // Rinzel & Miller 1980, Math Biosci 49:27; from memory); both tables must give the same spikes to the bit.
        var step = new Stimulus[] { Protocols.Step(10, 20, 200) };
        var settings = SimulationSettings.SpikesOnly;
        var init = cell.InitialState();
        int steps = (int)Math.Round(220 / DtMs);
        var spikesBefore = ScalarLoop.Run(cell, before, step[0], steps, settings, init, default).SpikeTimesMs;
        var spikesAfter = ScalarLoop.Run(cell, after, step[0], steps, settings, init, default).SpikeTimesMs;
        Assert.True(spikesBefore.Count >= 5, $"{spikesBefore.Count} spikes in 200 ms at 10 uA/cm2");
        Assert.Equal(spikesBefore, spikesAfter);
        if (SimdSupport.Missing is null)
        {
            var lanesBefore = SweepKernel.Run(cell, before, step, steps, settings, init, null, default);
            var lanesAfter = SweepKernel.Run(cell, after, step, steps, settings, init, null, default);
            Assert.Equal(lanesBefore[0].SpikeTimesMs, lanesAfter[0].SpikeTimesMs);
        }
    }

    [Fact]
    public void The_shared_store_has_the_documented_default_bound()
    {
        Assert.Equal(256L * 1024 * 1024, RateTableCache.Shared.BoundBytes);
        Assert.True(RateTableCache.Shared.HeldBytes <= RateTableCache.Shared.BoundBytes);
    }
}
