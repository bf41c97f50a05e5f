using System.Diagnostics;
using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;
using ExprModel.Core.Stochastic;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>
/// Mode "stochastic": (1) whole-cell channel noise for 1 s of a 20-gate model against the deterministic scalar run of the
/// same model (target ratio &lt;= 5); (2) a patch of 100 channels x 1,000 sweeps x 50 ms (target &lt;= 2 s). Medians of a
/// few repeats; shared machines: read the ratio.
/// </summary>
public static class StochasticBenchmark
{
    /// <summary>Fourteen entries with 20 gates in all, plus a leak, on a 2000 um2 cell at 34 C.</summary>
    private static readonly string[] TwentyGateEntries =
    [
        "nav-cortex-mainen1995", "kv3-fs-erisir1999", "kv2-cortex-mainen1996", "kv7-m-mainen1996", "kv4-a-golomb2006", "kv1-d-golomb2007",
        "hcn-vcn-rothman2003", "nap-ca1-golomb2006", "cav3-t-destexhe1996", "kv1-klt-rothman2003", "kir2-msn-wolf2005", "traub-na", "traub-kdr",
        "kv7-m-yamada", "leak",
    ];

    public static void Run(bool quick)
    {
        var catalog = CatalogLocator.Ensure();
        int repeats = quick ? 3 : 5;
        var channels = TwentyGateEntries.Select(id => catalog.Resolve(id, null))
            .Select(e => new ChannelInstance { Entry = e, DensityMsPerCm2 = e.TypicalDensityMsPerCm2 }).ToArray();
        var model = new CellModel { Geometry = new Geometry { AreaUm2 = 2000 }, TemperatureC = 34, Channels = channels, InitialVoltageMv = -70 };
        var cell = new CompiledCell(model);
        var stim = new StepCurrent(100, 800, 2);
        var unitary = ChannelNoise.UnitaryConductances(model, e => catalog.UnitaryConductances.For(e).ConductancePs);
        var noise = new ChannelNoiseSettings { UnitaryConductancesPs = unitary, RecordEvery = 0 };
        Simulator.Run(cell, stim, 1000, SimulationSettings.SpikesOnly);
        ChannelNoise.Run(cell, stim, 100, noise);
        double deterministic = Program.Median(repeats, () => Simulator.Run(cell, stim, 1000, SimulationSettings.SpikesOnly));
        double noisy = Program.Median(repeats, () => ChannelNoise.Run(cell, stim, 1000, noise));
        var counts = ChannelNoise.Run(cell, stim, 1, noise).ChannelCounts;
        Console.WriteLine($"whole cell, {cell.GateCount} gates, {counts.Sum():N0} channels (2000 um2): 1 s deterministic scalar {deterministic:F1} ms, " +
            $"with channel noise {noisy:F1} ms: ratio {noisy / deterministic:F1} (target <= 5)");

        var patch = new PatchSettings
        {
            Entry = catalog.Resolve("squid-na-hh1952", null),
            UnitaryConductancePs = 18,
            ChannelCount = 100,
            HoldingMv = -90,
            StepMv = 0,
            PreStepMs = 5,
            StepMs = 45,
            Sweeps = 1000,
            KeptSweeps = 5,
            SampleIntervalMs = 0.05,
        };
        var kdr = patch with { Entry = catalog.Resolve("squid-k-hh1952", null), UnitaryConductancePs = 20 };
        var fast = patch with { Entry = catalog.Resolve("nav-cortex-mainen1995", null), TemperatureC = 34 };
        foreach (var (label, s) in new[] { ("squid Na, 6.3 C", patch), ("squid K, 6.3 C", kdr), ("cortical Na, 34 C", fast) })
        {
            PatchClamp.Run(s with { Sweeps = 20 });
            double ms = Program.Median(repeats, () => PatchClamp.Run(s));
            Console.WriteLine($"patch {label}: 100 channels x 1000 sweeps x 50 ms: {ms:F0} ms (target <= 2000 ms; {Environment.ProcessorCount} cores)");
        }
    }
}
