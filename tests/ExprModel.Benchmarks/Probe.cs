using System.Diagnostics;
using ExprModel.Core.Analysis;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>"probe [model.json]": cost per step of the scalar loop and per vector step of the SIMD sweep.</summary>
internal static class Probe
{
    public static void Run(string? modelPath)
    {
        var catalog = CatalogLocator.Ensure();
        var doc = modelPath is null ? catalog.Preset("hh1952") : ModelDocument.Parse(File.ReadAllText(modelPath), modelPath);
        var cell = new CompiledCell(catalog.BuildCell(doc));
        var stims = Enumerable.Range(0, 4).Select(i => (Stimulus)Protocols.Step(i * 1.0, 100, 1000)).ToArray();
        Console.WriteLine($"{doc.Name}: {cell.ChannelCount} channels, {cell.GateCount} gates");
        for (int rep = 0; rep < 3; rep++)
        {
            var sw = Stopwatch.StartNew();
            var samples = stims.Select(s => s.Sample(0.025, 44800)).ToArray();
            var table = Simulator.TableFor(cell, 0.025);
            // Process CPU time, not wall time: the probe runs on one thread, and CPU time is far less disturbed by
            // other work on a shared machine.
            var proc = Process.GetCurrentProcess();
            var c0 = proc.TotalProcessorTime;
            SweepKernel.Run(cell, table, stims, 44800, SimulationSettings.SpikesOnly, cell.InitialState(), null, default);
            proc.Refresh();
            var c1 = proc.TotalProcessorTime;
            Simulator.Run(cell, stims[1], 1120, SimulationSettings.SpikesOnly);
            proc.Refresh();
            double tKernel = (c1 - c0).TotalMilliseconds, tScalar = (proc.TotalProcessorTime - c1).TotalMilliseconds;
            Console.WriteLine($"SIMD: {tKernel * 1e6 / 44800:F0} ns per vector step ({SweepKernel.Width} lanes, 4 used); scalar: " +
                $"{tScalar * 1e6 / 44800:F0} ns per step (process CPU time)");
        }
    }
}
