using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>
/// A density change reuses the kinetics (step plan, rate tables) instead of compiling again, and gives exactly what a
/// fresh compilation gives (identity: densities enter only the conductance product, never a rate).
/// </summary>
public sealed class KineticsCacheTests
{
    private static CellModel Moved(CellModel model, int channel, double relative) =>
        model with { Channels = model.Channels.Select((c, i) => i == channel ? c with { RelativeDensity = relative } : c).ToArray() };

    [Fact]
    public void A_walk_of_density_moves_compiles_the_kinetics_and_builds_the_rate_tables_once()
    {
        var model = TestCatalog.Catalog.BuildCell(TestCatalog.Catalog.Preset("cortex-rs2008"));
        var cache = new KineticsCache();
        var first = cache.Compile(model);
        var step = new StepCurrent(20, 100, 3);
        var settings = SimulationSettings.SpikesOnly;
        Simulator.Run(first, step, 150, settings);
        var moved = model;
        for (int move = 0; move < 6; move++)
        {
            moved = Moved(moved, move % model.Channels.Count, 0.6 + 0.15 * move);
            // The web runner compiles each move twice (trace and read-outs); both reuse the kinetics.
            var forTrace = cache.Compile(moved);
            var forReadouts = cache.Compile(moved);
            Assert.Same(first.Kinetics, forTrace.Kinetics);
            Assert.Equal(forTrace.Key, forReadouts.Key);
            Simulator.Run(forTrace, step, 150, settings);
            Simulator.SpikeTimes(forReadouts, [step, new StepCurrent(20, 100, 6)], 150, settings);
        }
        Assert.Equal(1, cache.KineticsBuilt);
        Assert.Equal(1, first.Kinetics.RateTablesBuilt);
        Assert.NotEqual(first.Key, cache.Compile(moved).Key);
    }

    [Fact]
    public void A_cell_on_shared_kinetics_simulates_exactly_as_a_fresh_compilation()
    {
        var model = TestCatalog.Catalog.BuildCell(TestCatalog.Catalog.Preset("wb1996"));
        var moved = Moved(model, 1, 1.4);
        var shared = new CompiledCell(model).WithDensities(moved);
        var fresh = new CompiledCell(moved);
        var step = new StepCurrent(20, 200, 1.5);
        var a = Simulator.Run(shared, step, 250, SimulationSettings.Default with { RecordEvery = 1 });
        var b = Simulator.Run(fresh, step, 250, SimulationSettings.Default with { RecordEvery = 1 });
        Assert.NotEmpty(a.SpikeTimesMs);
        Assert.Equal(b.SpikeTimesMs, a.SpikeTimesMs);
        Assert.Equal(b.VoltageMv, a.VoltageMv);
    }

    [Fact]
    public void Anything_but_densities_makes_new_kinetics()
    {
        var model = TestCatalog.Catalog.BuildCell(TestCatalog.Catalog.Preset("hh1952"));
        var cell = new CompiledCell(model);
        Assert.True(cell.Kinetics.Matches(Moved(model, 0, 2) with { Name = "renamed" }));
        Assert.True(cell.Kinetics.Matches(model with { Channels = model.Channels.Select(c => c with { DensityMsPerCm2 = 2 * c.DensityMsPerCm2 }).ToArray() }));
        Assert.False(cell.Kinetics.Matches(model with { TemperatureC = model.TemperatureC + 1 }));
        Assert.False(cell.Kinetics.Matches(model with { Channels = model.Channels.Select((c, i) => i == 0 ? c with { ShiftMv = 1 } : c).ToArray() }));
        Assert.False(cell.Kinetics.Matches(model with { Channels = model.Channels.Skip(1).ToArray() }));
        Assert.Throws<ArgumentException>(() => cell.WithDensities(model with { TemperatureC = model.TemperatureC + 1 }));
        Assert.Throws<ModelException>(() => cell.WithDensities(Moved(model, 0, -1)));
    }
}
