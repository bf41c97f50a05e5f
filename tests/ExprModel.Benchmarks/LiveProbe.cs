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
        var docs = Models(catalog, modelPaths, "wb1996", "cortex-rs2008", "hh1952", "cortex-fs2008");
        Console.WriteLine("live update cost, median of 7 (ms): read-outs (live settings): all | first stage cold | first stage seeded 5 % off | second stage " +
            "| 700 ms step: currents recorded throughout, and as the Workbench runs it (voltage, then the spike window again with gate states)");
        foreach (var (name, doc) in docs)
        {
            var cell = new CompiledCell(catalog.BuildCell(doc));
            Features.Measure(cell, ReadoutSettings.Live);
            var step = new StepCurrent(100, 500, 10);
            var settings = SimulationSettings.Default with { RecordEvery = 1, RecordCurrents = true };
            double read = Median(() => Features.Measure(cell, ReadoutSettings.Live));
            var first = Features.MeasureFirst(cell, ReadoutSettings.Live);
            double cold = Median(() => Features.MeasureFirst(cell, ReadoutSettings.Live));
            var hint = first.Hint is { } h ? h with { RheobaseUaPerCm2 = h.RheobaseUaPerCm2 * 1.05 } : null;
            double warm = Median(() => Features.MeasureFirst(cell, ReadoutSettings.Live, default, hint));
            double second = Median(() => Features.Complete(cell, first, ReadoutSettings.Live));
            double trace = Median(() => Simulator.Run(cell, step, 700, settings));
            // What the Workbench does: voltage with resume points, then the stretch around the first spike again with gate states.
            double workbench = Median(() =>
            {
                var t = Simulator.Run(cell, step, 700, settings with { RecordCurrents = false, KeepResumePoints = true });
                if (t.SpikeTimesMs.Count == 0) return;
                var from = t.ResumePoints.Last(r => r.TimeMs <= t.SpikeTimesMs[0] - 3);
                Simulator.Resume(cell, step, from, Math.Min(700, t.SpikeTimesMs[0] + 9), settings with { RecordCurrents = false, RecordGateStates = true });
            });
            Console.WriteLine($"{name,-24} {cell.GateCount,3} gates  all {read,7:F1} | first cold {cold,6:F1} | first seeded {warm,6:F1} | second " +
                $"{second,6:F1} | step with currents {trace,6:F1}, as the Workbench runs it {workbench,5:F1}");
            Moves(catalog, doc, hint);
        }
    }

    /// <summary>
    /// One relative-density move as the web runner serves it: the moved document compiled for the trace and for the
    /// read-outs, the trace as the Workbench runs it, the seeded first stage. Compiled afresh each time, or through a
    /// <see cref="KineticsCache"/> (kinetics and rate tables reused).
    /// </summary>
    private static void Moves(ChannelCatalog catalog, ModelDocument doc, RheobaseHint? hint)
    {
        var rel = new[] { 0.7, 1.3, 0.85, 1.15, 0.6, 1.45, 0.95 };
        var moved =
            rel.Select((r, i) => doc.WithRelativeDensities(new Dictionary<string, double> { [doc.Channels[i % doc.Channels.Count].Entry] = r })).ToArray();
        var cache = new KineticsCache();
        cache.Compile(catalog.BuildCell(doc));
        var step = new StepCurrent(100, 500, 10);
        var settings = SimulationSettings.Default with { RecordEvery = 1, KeepResumePoints = true };
        int m = 0;
        double Move(Func<ModelDocument, CompiledCell> compile, bool simulate)
        {
            var d = moved[m++ % moved.Length];
            var sw = Stopwatch.StartNew();
            var forTrace = compile(d);
            var forReadouts = compile(d);
            if (simulate)
            {
                Simulator.Run(forTrace, step, 700, settings);
                Features.MeasureFirst(forReadouts, ReadoutSettings.Live, default, hint);
            }
            return sw.Elapsed.TotalMilliseconds;
        }
        CompiledCell Fresh(ModelDocument d) => new(catalog.BuildCell(d));
        CompiledCell Cached(ModelDocument d) => cache.Compile(catalog.BuildCell(d));
        double MedianOf(Func<double> run) => Enumerable.Range(0, 7).Select(_ => run()).Order().ElementAt(3);
        // Compilation alone includes the first simulation's rate-table set-up, so each compiled cell runs 1 ms.
        double CompileOnly(Func<ModelDocument, CompiledCell> compile) => MedianOf(() =>
        {
            var sw = Stopwatch.StartNew();
            var c = compile(moved[m++ % moved.Length]);
            Simulator.Run(c, new NoCurrent(), 1, SimulationSettings.SpikesOnly);
            return sw.Elapsed.TotalMilliseconds;
        });
        double freshCompile = CompileOnly(Fresh), cachedCompile = CompileOnly(Cached);
        double freshMove = MedianOf(() => Move(Fresh, true)), cachedMove = MedianOf(() => Move(Cached, true));
        Console.WriteLine($"{"",-24} density move: compile + 1 ms run {freshCompile:F3} ms fresh, {cachedCompile:F3} ms via kinetics cache | whole move (2 " +
            $"compiles, Workbench trace, seeded first stage) {freshMove:F1} ms fresh, {cachedMove:F1} ms cached");
    }

    /// <summary>
    /// Rounds of the rheobase search over a browser-benchmark-like walk (25 moves: a random channel to 49-219 %): cold,
    /// seeded with the previous rheobase, and seeded with the previous rheobase scaled by the ratio of slope conductances
    /// (<see cref="RheobaseHint"/>, what the Workbench uses). Counts, not times: independent of machine load.
    /// </summary>
    public static void Rounds(IReadOnlyList<string> modelPaths)
    {
        var catalog = CatalogLocator.Ensure();
        var docs = Models(catalog, modelPaths, "wb1996", "cortex-rs2008");
        var s = ReadoutSettings.Live;
        double gridStep = Math.Log(1 + s.RheobaseRelativeTolerance);
        foreach (var (name, doc) in docs)
        {
            var rng = new Random(7);
            var rel = doc.Channels.Select(c => c.RelativeDensity).ToArray();
            RheobaseHint? previous = null;
            int cold = 0, byRheobase = 0, byHint = 0, moves = 0, sameAnswer = 0;
            var errRheobase = new List<double>();
            var errHint = new List<double>();
            for (int m = 0; m < 25; m++)
            {
                int ch = rng.Next(rel.Length);
                int pos = rng.Next(650, 900);
                rel[ch] = 0.01 * Math.Pow(400, (pos - 1) / 999.0);
                var moved = doc with { Channels = doc.Channels.Select((c, i) => c with { RelativeDensity = rel[i] }).ToArray() };
                var cell = new CompiledCell(catalog.BuildCell(moved));
                var first = Features.MeasureFirst(cell, s);
                if (first.RestState is not { } rest || first.SlopeConductanceMsPerCm2 is not { } g) continue;
                var (start, max) = Rheobase.SearchRange(g);
                var c = Rheobase.Search(cell, rest, start, max, s).Bracket;
                var r = Rheobase.Search(cell, rest, start, max, s, default, previous?.RheobaseUaPerCm2).Bracket;
                var h = Rheobase.Search(cell, rest, start, max, s, default, previous?.PredictFor(g)).Bracket;
                if (c is null || r is null || h is null) continue;
                if (previous is { } p)
                {
                    errRheobase.Add(Math.Abs(Math.Log(p.RheobaseUaPerCm2 / c.AtOrAboveUaPerCm2)) / gridStep);
                    errHint.Add(Math.Abs(Math.Log(p.PredictFor(g) / c.AtOrAboveUaPerCm2)) / gridStep);
                }
                moves++;
                cold += c.Rounds;
                byRheobase += r.Rounds;
                byHint += h.Rounds;
                if (c.AtOrAboveUaPerCm2 == r.AtOrAboveUaPerCm2 && c.AtOrAboveUaPerCm2 == h.AtOrAboveUaPerCm2) sameAnswer++;
                previous = first.Hint;
            }
            static double Med(List<double> x) => x.Count == 0 ? double.NaN : x.Order().ElementAt(x.Count / 2);
            Console.WriteLine($"{name,-24} {moves} moves, rheobase search rounds: cold {cold / (double)moves:F2}, " +
                $"from the previous rheobase {byRheobase / (double)moves:F2}, " +
                $"from the slope-scaled hint {byHint / (double)moves:F2}; " +
                $"median start error in grid steps {Med(errRheobase):F1} and {Med(errHint):F1}; same answer {sameAnswer}/{moves}");
        }
    }

    /// <summary>"stages [model.json ...]": where the first stage's time goes (settle, passive step, rheobase search, spike-shape run).</summary>
    public static void Stages(IReadOnlyList<string> modelPaths)
    {
        var catalog = CatalogLocator.Ensure();
        var docs = Models(catalog, modelPaths, "wb1996", "cortex-rs2008");
        var s = ReadoutSettings.Live;
        var sim = s.Simulation;
        Console.WriteLine("first-stage parts, median of 7 (ms): settle | passive step | rheobase search (cold, seeded 5 % off) | shape run");
        foreach (var (name, doc) in docs)
        {
            var cell = new CompiledCell(catalog.BuildCell(doc));
            var first = Features.MeasureFirst(cell, s);
            if (first.RestState is not { } rest || first.SlopeConductanceMsPerCm2 is not { } g || first.RheobaseUaPerCm2 is not { } rb)
            {
                Console.WriteLine($"{name}: no rheobase");
                continue;
            }
            var (start, max) = Rheobase.SearchRange(g);
            double settle = Median(() => Simulator.Run(cell, new NoCurrent(), s.SettleMs, sim with { RecordEvery = 0 }));
            double passive =
                Median(() => Simulator.Run(cell, Protocols.Step(-5 * g, 100, s.PassiveStepMs), 100 + s.PassiveStepMs, sim with { RecordEvery = 1 }, rest));
            double cold = Median(() => Rheobase.Search(cell, rest, start, max, s));
            double seeded = Median(() => Rheobase.Search(cell, rest, start, max, s, default, rb * 1.05));
            double latency = Rheobase.Search(cell, rest, start, max, s).LatencyMs ?? s.StepDurationMs;
            double shape = Median(() => Simulator.Run(cell, Protocols.Step(rb, 100, s.StepDurationMs), Math.Min(100 + s.StepDurationMs, 100 + latency + 150),
                sim with { RecordEvery = 1 }, rest));
            var resume = Rheobase.Search(cell, rest, start, max, s).BeforeFirstSpike;
            double resumed = resume is null ? double.NaN : Median(() => Simulator.Resume(cell, Protocols.Step(rb, 100, s.StepDurationMs), resume,
                Math.Min(100 + s.StepDurationMs, 100 + latency + 150), sim with { RecordEvery = 1 }));
            var traceStep = Protocols.Step(2 * rb, 100, 500);
            double traceGates = Median(() => Simulator.Run(cell, traceStep, 700, sim with { RecordEvery = 1, RecordGateStates = true }));
            double traceBare = Median(() => Simulator.Run(cell, traceStep, 700, sim with { RecordEvery = 1 }));
            Console.WriteLine($"{name,-24} Workbench trace (700 ms at 2 x rheobase): with gate states {traceGates,5:F1}, voltage only {traceBare,5:F1}");
            Console.WriteLine($"{name,-24} settle {settle,5:F1} | passive {passive,5:F1} | search cold {cold,5:F1} seeded {seeded,5:F1} | shape from rest " +
                $"{shape,5:F1}, resumed {resumed,5:F1} (latency {latency:F0} ms)");
        }
    }

    /// <summary>The model files named on the command line (labelled by file name), or the given presets when none are.</summary>
    private static List<(string Name, ModelDocument Doc)> Models(ChannelCatalog catalog, IReadOnlyList<string> modelPaths, params string[] presets) =>
        modelPaths.Count == 0
            ? presets.Select(p => (p, catalog.Preset(p))).ToList()
            : modelPaths.Select(p => (Path.GetFileName(p), ModelDocument.Parse(File.ReadAllText(p), p))).ToList();

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
