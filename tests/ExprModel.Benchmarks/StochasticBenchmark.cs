using System.Diagnostics;
using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;
using ExprModel.Core.Stochastic;
using ExprModel.Core.Tests.Stochastic;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>
/// Mode "stochastic": (1) whole-cell channel noise for 1 s of a 20-gate model against the deterministic scalar run of the
/// same model (target ratio &lt;= 5): the default (diffusion approximation for large channel types, binomial tracking for
/// the rest), diffusion for every type, binomial tracking for every type, and binomial tracking with every draw exact;
/// (2) a patch of 100 channels x 1,000 sweeps x 50 ms (target &lt;= 2 s). The noisy and deterministic runs alternate
/// after a warm-up and the ratio is the median of the pairs' ratios, so a load change on a shared machine hits both
/// sides of a ratio alike.
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
        int repeats = quick ? 3 : 7;
        var channels = TwentyGateEntries.Select(id => catalog.Resolve(id, null))
            .Select(e => new ChannelInstance { Entry = e, DensityMsPerCm2 = e.TypicalDensityMsPerCm2 }).ToArray();
        var model = new CellModel { Geometry = new Geometry { AreaUm2 = 2000 }, TemperatureC = 34, Channels = channels, InitialVoltageMv = -70 };
        var cell = new CompiledCell(model);
        var stim = new StepCurrent(100, 800, 2);
        var unitary = ChannelNoise.UnitaryConductances(model, e => catalog.UnitaryConductances.For(e).ConductancePs);
        var noise = new ChannelNoiseSettings { UnitaryConductancesPs = unitary, RecordEvery = 0 };
        var probe = ChannelNoise.Run(cell, stim, 1, noise);
        var counts = probe.ChannelCounts;
        Console.WriteLine("channel types: " + string.Join(", ", model.Channels.Select((c, i) => $"{c.Entry.Id} {counts[i]:N0} ({probe.Methods[i]})")));
        var runs = new[]
        {
            ($"default (diffusion from {noise.DiffusionFromChannels:N0} channels)", noise),
            ("diffusion for every type", noise with { DiffusionFromChannels = 1 }),
            ("binomial tracking only, default draws", noise with { DiffusionFromChannels = int.MaxValue }),
            ("binomial tracking only, all draws exact", noise with { DiffusionFromChannels = int.MaxValue, ExactUpToMean = double.PositiveInfinity }),
        };
        foreach (var (label, settings) in runs)
        {
            // Warm-up until the JIT has settled (tiered compilation): a few full-length runs of each side.
            for (int w = 0; w < 3; w++)
            {
                Simulator.Run(cell, stim, 1000, SimulationSettings.SpikesOnly);
                ChannelNoise.Run(cell, stim, 1000, settings);
            }
            var pairs = new (double Noisy, double Deterministic)[repeats];
            for (int r = 0; r < repeats; r++)
            {
                double noisy = Time(() => ChannelNoise.Run(cell, stim, 1000, settings));
                pairs[r] = (noisy, Time(() => Simulator.Run(cell, stim, 1000, SimulationSettings.SpikesOnly)));
            }
            double ratio = Median(pairs.Select(p => p.Noisy / p.Deterministic));
            Console.WriteLine($"whole cell, {cell.GateCount} gates, {counts.Sum():N0} channels (2000 um2), {label}: 1 s with channel noise " +
                $"{Median(pairs.Select(p => p.Noisy)):F1} ms, deterministic scalar {Median(pairs.Select(p => p.Deterministic)):F1} ms: " +
                $"ratio {ratio:F1} (target <= 5)");
        }

        var sodium = PatchEnsembles.SodiumStep(catalog, channels: 100, sweeps: 1000) with { PreStepMs = 5, StepMs = 45, KeptSweeps = 5 };
        var kdr = PatchEnsembles.PotassiumAt(catalog, -90, channels: 100, sweeps: 1000) with { StepMv = 0, PreStepMs = 5, StepMs = 45, KeptSweeps = 5 };
        var fast = sodium with { Entry = catalog.Resolve("nav-cortex-mainen1995", null), TemperatureC = 34 };
        foreach (var (label, s) in new[] { ("squid Na, 6.3 C", sodium), ("squid K, 6.3 C", kdr), ("cortical Na, 34 C", fast) })
        {
            PatchClamp.Run(s with { Sweeps = 20 });
            double ms = Program.Median(repeats, () => PatchClamp.Run(s));
            Console.WriteLine($"patch {label}: 100 channels x 1000 sweeps x 50 ms: {ms:F0} ms (target <= 2000 ms; {Environment.ProcessorCount} cores)");
        }
    }

    private static double Time(Action a)
    {
        var sw = Stopwatch.StartNew();
        a();
        return sw.Elapsed.TotalMilliseconds;
    }

    private static double Median(IEnumerable<double> values)
    {
        var v = values.OrderBy(x => x).ToArray();
        return v[v.Length / 2];
    }
}
