using System.Diagnostics;
using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

internal static class Probe
{
    public static void Run()
    {
        var catalog = CatalogLocator.Ensure();
        var cell = new CompiledCell(catalog.BuildCell(catalog.Preset("hh1952")));
        var stims = Enumerable.Range(0, 4).Select(i => (Stimulus)Protocols.Step(i * 3.0, 100, 1000)).ToArray();
        for (int rep = 0; rep < 3; rep++)
        {
            var sw = Stopwatch.StartNew();
            var samples = stims.Select(s => s.Sample(0.025, 44800)).ToArray();
            double tSample = sw.Elapsed.TotalMilliseconds; sw.Restart();
            var table = Simulator.TableFor(cell, 0.025);
            var r = SweepKernel.Run(cell, table, samples, 44800, SimulationSettings.SpikesOnly, cell.InitialState(), default);
            double tKernel = sw.Elapsed.TotalMilliseconds; sw.Restart();
            var one = Simulator.SpikeTimes(cell, stims, 1120);
            double tAll = sw.Elapsed.TotalMilliseconds;
            Console.WriteLine($"sample {tSample:F2} ms, kernel (1 group of 4, one thread) {tKernel:F2} ms = {tKernel * 1e6 / 44800:F0} ns per vector step, SpikeTimes(4) {tAll:F2} ms; spikes {r.Sum(x => x.Count)}");
        }
    }
}
