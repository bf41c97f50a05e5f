using System.Diagnostics;
using ExprModel.Core.Analysis;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>"live [model.json ...]": server-side cost of one Workbench update (live read-outs, one recorded step).</summary>
internal static class LiveProbe
{
    public static void Run(IReadOnlyList<string> modelPaths)
    {
        var catalog = CatalogLocator.Ensure();
        var docs = modelPaths.Count == 0
            ? new[] { "wb1996", "cortex-rs2008", "hh1952", "cortex-fs2008" }.Select(p => (p, catalog.Preset(p))).ToList()
            : modelPaths.Select(p => (Path.GetFileName(p), ModelDocument.Parse(File.ReadAllText(p), p))).ToList();
        Console.WriteLine("live update cost, median of 7 (ms): read-outs (live settings): all | first stage cold | first stage seeded 5 % off | second stage | 700 ms step with currents");
        foreach (var (name, doc) in docs)
        {
            var cell = new CompiledCell(catalog.BuildCell(doc));
            Features.Measure(cell, ReadoutSettings.Live);
            var step = new StepCurrent(100, 500, 10);
            var settings = SimulationSettings.Default with { RecordEvery = 1, RecordCurrents = true };
            double read = Median(() => Features.Measure(cell, ReadoutSettings.Live));
            var first = Features.MeasureFirst(cell, ReadoutSettings.Live);
            double cold = Median(() => Features.MeasureFirst(cell, ReadoutSettings.Live));
            double? hint = first.RheobaseUaPerCm2 * 1.05;
            double warm = Median(() => Features.MeasureFirst(cell, ReadoutSettings.Live, default, hint));
            double second = Median(() => Features.Complete(cell, first, ReadoutSettings.Live));
            double trace = Median(() => Simulator.Run(cell, step, 700, settings));
            Console.WriteLine($"{name,-24} {cell.GateCount,3} gates  all {read,7:F1} | first cold {cold,6:F1} | first seeded {warm,6:F1} | second {second,6:F1} | step {trace,6:F1}");
        }
    }

    private static double Median(Action run)
    {
        var t = new double[7];
        for (int i = 0; i < t.Length; i++)
        {
            var sw = Stopwatch.StartNew();
            run();
            t[i] = sw.Elapsed.TotalMilliseconds;
        }
        Array.Sort(t);
        return t[3];
    }
}
