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
            double bare = Median(() => Simulator.Run(cell, step, 700, settings with { RecordCurrents = false }));
            Console.WriteLine($"{name,-24} {cell.GateCount,3} gates  all {read,7:F1} | first cold {cold,6:F1} | first seeded {warm,6:F1} | second {second,6:F1} | step {trace,6:F1} (without currents {bare,5:F1})");
        }
    }

    /// <summary>
    /// Rounds of the rheobase search over a browser-benchmark-like walk (25 moves: a random channel to 49-219 %),
    /// seeded with the previous rheobase versus cold. Counts, not times: independent of machine load.
    /// </summary>
    public static void Rounds(IReadOnlyList<string> modelPaths)
    {
        var catalog = CatalogLocator.Ensure();
        var docs = modelPaths.Count == 0
            ? new[] { "wb1996", "cortex-rs2008" }.Select(p => (p, catalog.Preset(p))).ToList()
            : modelPaths.Select(p => (Path.GetFileName(p), ModelDocument.Parse(File.ReadAllText(p), p))).ToList();
        var s = ReadoutSettings.Live;
        foreach (var (name, doc) in docs)
        {
            var rng = new Random(7);
            var rel = doc.Channels.Select(c => c.RelativeDensity).ToArray();
            double? previous = null;
            int seeded = 0, cold = 0, moves = 0, sameAnswer = 0;
            for (int m = 0; m < 25; m++)
            {
                int ch = rng.Next(rel.Length);
                int pos = rng.Next(650, 900);
                rel[ch] = 0.01 * Math.Pow(400, (pos - 1) / 999.0);
                var moved = doc with { Channels = doc.Channels.Select((c, i) => c with { RelativeDensity = rel[i] }).ToArray() };
                var cell = new CompiledCell(catalog.BuildCell(moved));
                var first = Features.MeasureFirst(cell, s);
                if (first.RestState is not { } rest || first.SlopeConductanceMsPerCm2 is not { } g) continue;
                var (start, max) = Features.RheobaseSearchRange(g);
                var c = RheobaseSearch.Rheobase(cell, rest, start, max, s).Bracket;
                var w = RheobaseSearch.Rheobase(cell, rest, start, max, s, default, previous).Bracket;
                if (c is null || w is null) continue;
                moves++;
                cold += c.Rounds;
                seeded += w.Rounds;
                if (c.AtOrAboveUaPerCm2 == w.AtOrAboveUaPerCm2) sameAnswer++;
                previous = c.AtOrAboveUaPerCm2;
            }
            Console.WriteLine($"{name,-24} {moves} moves: rheobase rounds seeded {seeded / (double)moves:F2}, cold {cold / (double)moves:F2}; same answer {sameAnswer}/{moves}");
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
