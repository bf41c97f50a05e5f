using System.Diagnostics;
using ExprModel.Core.Analysis;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Perturbation;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>
/// "whatif": on the demo group model with the most channels (built as `exprmodel build` does), all channel
/// knock-downs (target 5 s for 20 channels), the sensitivity matrix (target 10 s) and a fit of 12 free densities to 6
/// read-outs (target 60 s). The fit's "recording" is the same model with three densities moved by known factors.
/// </summary>
public static class WhatIfBenchmark
{
    public static void Run()
    {
        var catalog = CatalogLocator.Ensure();
        var dir = CatalogLocator.FindSourceDirectory() ?? throw new InvalidOperationException("catalog/ not found");
        var data = ExpressionDataset.Read(catalog.ForMapping(), Path.Combine(dir, "demo", "counts.csv"), new ExpressionReadOptions(),
            Path.Combine(dir, "demo", "metadata.csv"), "group");
        var report = data.Map();
        var built = data.Targets.Select(t => data.Build(report, new DensityRule(), t)).OrderByDescending(b => b.Document.Channels.Count).First();
        var doc = built.Document;
        var model = catalog.BuildCell(doc);
        Console.WriteLine($"machine: {Environment.ProcessorCount} cores (shared), load average {File.ReadAllText("/proc/loadavg").Split(' ')[0]}");
        Console.WriteLine($"model: {doc.Name}, {model.Channels.Count} channels");
        Simulator.Run(new CompiledCell(model), Protocols.Step(1, 0, 200), 200, SimulationSettings.SpikesOnly); // rate tables

        var labels = new DensityProbe(model, Knockdown.DefaultSettings).ChannelLabels;
        var proc = Process.GetCurrentProcess();
        double Cpu() { proc.Refresh(); return proc.TotalProcessorTime.TotalSeconds; }
        double cpu = Cpu();
        string CpuSince()
        {
            double now = Cpu(), d = now - cpu;
            cpu = now;
            return FormattableString.Invariant($"process CPU {d:F1} s = {d / Environment.ProcessorCount:F1} s wall on {Environment.ProcessorCount} idle cores");
        }
        var sw = Stopwatch.StartNew();
        var kd = Knockdown.Run(model, KnockdownTarget.Channels(labels, 0), 0);
        Console.WriteLine($"knock-downs: {labels.Count} channels at 0 in {sw.Elapsed.TotalSeconds:F1} s (target 5 s); {kd.Failures.Count} variants failed; " +
            $"{CpuSince()}");

        sw.Restart();
        var m = Sensitivity.Run(model);
        Console.WriteLine($"sensitivity: {m.Channels.Count} channels x {m.Columns.Count} read-outs, {1 + 2 * m.Channels.Count} variants in " +
            $"{sw.Elapsed.TotalSeconds:F1} s (target 10 s); {CpuSince()}");

        // Twelve free densities: the largest twelve; the rest held. The recording moves three of them by known factors.
        var free = Enumerable.Range(0, labels.Count).OrderByDescending(k => model.Channels[k].EffectiveDensityMsPerCm2).Take(12).ToHashSet();
        var factors = Enumerable.Repeat(1.0, labels.Count).ToArray();
        var moved = free.Take(3).ToArray();
        factors[moved[0]] = 0.8;
        factors[moved[1]] = 1.25;
        factors[moved[2]] = 0.8;
        string[] names = ["rheobase", "resting_potential", "input_resistance", "spike_half_width", "after_hyperpolarisation", "fi_gain"];
        var truth = ReadoutValues.From(Features.Measure(new CompiledCell(new DensityProbe(model, SensitivitySettings.TightReadouts).Scaled(factors)),
            SensitivitySettings.TightReadouts));
        var targets = names.Where(n => truth[n] is not null).Select(n => FitTarget.WithDefaultScale(n, truth[n]!.Value)).ToArray();
        Console.WriteLine("fit targets: "
            + string.Join(", ", targets.Select(t => FormattableString.Invariant($"{t.Readout}={t.Value:G4} {t.Unit} (scale {t.Scale:G3})"))));
        Console.WriteLine("truth: " + string.Join(", ", moved.Select(k => $"{labels[k]} x{factors[k]}")));
        CpuSince();
        var settings = FitSettings.Default with
        {
            Starts = 1,
            FixedChannels = Enumerable.Range(0, labels.Count).Where(k => !free.Contains(k)).Select(k => labels[k]).ToHashSet()
        };
        sw.Restart();
        var fit = DensityFit.Run(doc, model, targets, settings);
        Console.WriteLine($"fit: 12 densities to {targets.Length} read-outs, {fit.Evaluations} evaluations in {sw.Elapsed.TotalSeconds:F1} s (target 60 s); " +
            $"{fit.Starts[0].Exit}; {CpuSince()}");
        Console.WriteLine("  " + fit.Summary);
        foreach (var c in fit.Channels.Where(c => !c.Fixed))
        {
            Console.WriteLine(FormattableString.Invariant(
                $"  {c.Channel,-24} fitted x{c.FittedRelative:F3} (truth x{factors[labels.ToList().IndexOf(c.Channel)]}) pinned {c.Pinned}"));
        }
    }
}
