using ExprModel.Core.Analysis;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>
/// "kernel [model.json]": nanoseconds per integration step of one SIMD sweep group and of the scalar loop, for the model
/// and for the model without its calcium machinery (BK, SK and calcium channels) or its sodium-activated potassium (and so its
/// sodium shell), so the cost of each part shows.
/// Best of 15 runs: on a shared machine the minimum is the least disturbed figure.
/// </summary>
internal static class KernelProbe
{
    private const int Steps = 44800; // 1120 ms at 25 us, one f-I step

    public static void Run(string? path)
    {
        var catalog = CatalogLocator.Ensure();
        var doc = path is null ? catalog.Preset("cortex-rs2008") : ModelDocument.Parse(File.ReadAllText(path), path);
        Console.WriteLine($"{doc.Name}: ns per step, best of 15 (SIMD group of {SweepKernel.Width} lanes | scalar loop)");
        for (int i = 0; i < 2; i++) Time("warm-up", doc);
        Time("whole model", doc);
        Time("without BK and SK", doc with { Channels = doc.Channels.Where(c => !IsCalciumActivated(c)).ToArray() });
        Time("without calcium channels", doc with { Channels = doc.Channels.Where(c => !c.Entry.StartsWith("cav")).ToArray() });
        Time("without either", doc with { Channels = doc.Channels.Where(c => !IsCalciumActivated(c) && !c.Entry.StartsWith("cav")).ToArray() });
        if (doc.Channels.Any(c => c.Entry.StartsWith("kna")))
            Time("without KNa (sodium shell)", doc with { Channels = doc.Channels.Where(c => !c.Entry.StartsWith("kna")).ToArray(), SodiumShell = null });

        void Time(string label, ModelDocument d)
        {
            var cell = new CompiledCell(catalog.BuildCell(d));
            var rest = Simulator.Run(cell, new NoCurrent(), 300, SimulationSettings.SpikesOnly).FinalState;
            var stims = Enumerable.Range(0, SweepKernel.Width).Select(i => (Stimulus)Protocols.Step(0.01 * i, 100, 1000)).ToArray();
            var table = Simulator.TableFor(cell, 0.025);
            double simd = Best(() => SweepKernel.Run(cell, table, stims, Steps, SimulationSettings.SpikesOnly, rest, null, default));
            double scalar = Best(() => Simulator.Run(cell, stims[1], Steps * 0.025, SimulationSettings.SpikesOnly, rest));
            Console.WriteLine($"{label,-26} {cell.GateCount,3} gates {cell.ChannelCount,3} channels: " +
                $"SIMD {simd * 1e6 / Steps,5:F0} | scalar {scalar * 1e6 / Steps,5:F0}");
        }
    }

    private static bool IsCalciumActivated(ChannelDocument c) => c.Entry.StartsWith("bk") || c.Entry.StartsWith("sk");

    private static double Best(Action run)
    {
        double best = double.MaxValue;
        for (int i = 0; i < 15; i++)
        {
            var sw = System.Diagnostics.Stopwatch.StartNew();
            run();
            best = Math.Min(best, sw.Elapsed.TotalMilliseconds);
        }
        return best;
    }
}
