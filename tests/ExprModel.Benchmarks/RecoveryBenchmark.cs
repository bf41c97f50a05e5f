using System.Diagnostics;
using System.Globalization;
using System.Text.Json.Nodes;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Perturbation;
using ExprModel.Core.Recordings;
using ExprModel.Data.Catalog;
using ExprModel.Data.Demo;

namespace ExprModel.Benchmarks;

/// <summary>
/// Report mode "recovery [CELL ...]": for demo cells with recordings (default: the first cell of each group), build the
/// per-cell model as the recording generator did (raw counts, default density rule, no shrinkage), fit it to the
/// read-outs measured from its recording (<see cref="RecordedFitTargets"/> defaults, one start, the recorded 400 ms
/// step) and compare the fitted fold changes with the hidden factors of catalog/demo/recordings/hidden-factors.json.
/// Error per channel: |ln(fitted / hidden)|; "expression alone" is |ln hidden| (every fold change 1). Not timed against a target.
/// </summary>
public static class RecoveryBenchmark
{
    public static void Run(IReadOnlyList<string> cells)
    {
        var catalog = CatalogLocator.Ensure();
        var dir = Path.Combine(CatalogLocator.FindSourceDirectory() ?? throw new InvalidOperationException("catalog/ not found"), "demo");
        var data = ExpressionDataset.Read(catalog.ForMapping(), Path.Combine(dir, "counts.csv"), new ExpressionReadOptions(),
            Path.Combine(dir, "metadata.csv"), "group");
        var report = data.Map();
        var hidden = JsonNode.Parse(File.ReadAllText(Path.Combine(dir, DemoRecordingGenerator.DirectoryName,
            DemoRecordingGenerator.SidecarFileName)))!["cells"]!.AsArray()
            .ToDictionary(c => (string)c!["cell"]!, c => c!["density_factors"]!.AsObject().ToDictionary(p => p.Key, p => (double)p.Value!));
        var ids = cells.Count > 0 ? cells : DemoDataGenerator.Groups.Select((_, g) => $"FH{g + 1}001").ToArray();
        Console.WriteLine($"machine: {Environment.ProcessorCount} cores (shared), load average {File.ReadAllText("/proc/loadavg").Split(' ')[0]}");
        var pinnedErrors = new List<(double Fit, double Alone)>();
        var freeErrors = new List<(double Fit, double Alone)>();
        foreach (var id in ids)
        {
            var doc = data.Build(report, new DensityRule(), ModelTarget.ForCell(id)).Document;
            var model = catalog.BuildCell(doc);
            var measured = RecordingReader.Read(Path.Combine(dir, DemoRecordingGenerator.DirectoryName, id + ".nwb"))
                .Select(c => RecordingFeatures.Measure(c)).ToArray();
            var features = RecordedSweepFeatures.From(measured, id + ".nwb", _ => true);
            RecordedTargets targets;
            try { targets = RecordedFitTargets.ForCell(features, id, model.Geometry.AreaUm2, measured[0].RheobaseStepSpacingPa); }
            catch (ArgumentException e) { Console.WriteLine($"{id}: no fit ({e.Message})"); continue; }
            var settings = FitSettings.Default with
            {
                Starts = 1,
                Readouts = FitSettings.Default.Readouts with { StepDurationMs = RecordedFitTargets.StepDurationMs(measured) ?? 1000 }
            };
            var proc = Process.GetCurrentProcess();
            double cpu = proc.TotalProcessorTime.TotalSeconds;
            var sw = Stopwatch.StartNew();
            var fit = DensityFit.Run(doc, model, targets.Targets, settings);
            proc.Refresh();
            Console.WriteLine(
                FormattableString.Invariant($"{id}: {targets.Targets.Count} targets ({string.Join(", ", targets.Targets.Select(t => t.Readout))}); ")
                + FormattableString.Invariant($"misfit {fit.MisfitBefore:0.##} -> {fit.MisfitAfter:0.##} scales RMS; {fit.Evaluations} evaluations, ")
                + FormattableString.Invariant($"{sw.Elapsed.TotalSeconds:0.#} s wall, {proc.TotalProcessorTime.TotalSeconds - cpu:0.#} s CPU"));
            Console.WriteLine($"  {"channel",-28} {"hidden",7} {"fitted",7} {"pinned",6} {"err fit",8} {"err alone",9}");
            foreach (var ch in fit.Channels)
            {
                if (!hidden[id].TryGetValue(ch.Channel, out var h)) continue;
                double errFit = Math.Abs(Math.Log(ch.FoldChange / h)), errAlone = Math.Abs(Math.Log(h));
                (ch.Pinned ? pinnedErrors : freeErrors).Add((errFit, errAlone));
                Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
                    $"  {ch.Channel,-28} {h,7:0.###} {ch.FoldChange,7:0.###} {(ch.Pinned ? "yes" : "no"),6} {errFit,8:0.###} {errAlone,9:0.###}"));
            }
        }
        foreach (var (name, list) in new[] { ("pinned", pinnedErrors), ("free", freeErrors) })
            if (list.Count > 0)
                Console.WriteLine(
                    FormattableString.Invariant($"{name} channels: {list.Count}; median |ln(fitted/hidden)| {Median(list.Select(e => e.Fit)):0.###} ")
                    + FormattableString.Invariant($"(expression alone {Median(list.Select(e => e.Alone)):0.###}); ")
                    + FormattableString.Invariant($"within ln 1.5: {list.Count(e => e.Fit <= Math.Log(1.5))} of {list.Count}"));
    }

    private static double Median(IEnumerable<double> values)
    {
        var v = values.Order().ToArray();
        return v.Length % 2 == 1 ? v[v.Length / 2] : (v[v.Length / 2 - 1] + v[v.Length / 2]) / 2;
    }
}
