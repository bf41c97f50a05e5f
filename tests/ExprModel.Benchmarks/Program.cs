using System.Diagnostics;
using System.Globalization;
using BenchmarkDotNet.Running;
using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>
/// Benchmark command. Default: the simulator workloads of issue 2 side by side with the native C yardstick
/// (../shared/bench/hh_native.c, built with gcc -O3 -march=native), printing times and ratios. "--bdn" runs the
/// BenchmarkDotNet suite instead. Numbers vary on shared machines: read ratios, not absolute times.
/// </summary>
public static class Program
{
    public static int Main(string[] args)
    {
        if (args.Contains("--bdn"))
        {
            BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args.Where(a => a != "--bdn").ToArray());
            return 0;
        }
        if (args.Contains("atlas")) { AtlasBenchmark.Run(args); return 0; }
        if (args.Contains("whatif")) { WhatIfBenchmark.Run(); return 0; }
        if (args.Contains("stochastic")) { StochasticBenchmark.Run(args.Contains("--quick")); return 0; }
        if (args.Contains("recordings")) { RecordingsBenchmark.Run(); return 0; }
        if (args.Contains("recovery"))
        {
            RecoveryBenchmark.Run(args.SkipWhile(a => a != "recovery").Skip(1).Where(a => !a.StartsWith('-')).ToArray());
            return 0;
        }
        if (args.Contains("rounds")) { LiveProbe.Rounds(args.SkipWhile(a => a != "rounds").Skip(1).Where(a => !a.StartsWith("--")).ToList()); return 0; }
        if (args.Contains("kernel")) { KernelProbe.Run(args.SkipWhile(a => a != "kernel").Skip(1).FirstOrDefault(a => !a.StartsWith("--"))); return 0; }
        if (args.Contains("stages")) { LiveProbe.Stages(args.SkipWhile(a => a != "stages").Skip(1).Where(a => !a.StartsWith("--")).ToList()); return 0; }
        if (args.Contains("live")) { LiveProbe.Run(args.SkipWhile(a => a != "live").Skip(1).Where(a => !a.StartsWith("--")).ToList()); return 0; }
        if (args.Contains("probe")) { Probe.Run(args.SkipWhile(a => a != "probe").Skip(1).FirstOrDefault(a => !a.StartsWith("--"))); return 0; }
        if (args.Contains("batch"))
        {
            string? After(string flag) => args.SkipWhile(a => a != flag).Skip(1).FirstOrDefault();
            if (args.Contains("--alternatives")) BatchBenchmark.Alternatives(int.Parse(After("--alternatives") ?? "200", CultureInfo.InvariantCulture));
            else if (args.Contains("--kernel")) BatchBenchmark.Kernel(int.Parse(After("--kernel") ?? "20", CultureInfo.InvariantCulture));
            else if (args.Contains("--stages")) BatchBenchmark.Stages(int.Parse(After("--stages") ?? "100", CultureInfo.InvariantCulture));
            else BatchBenchmark.Run(args.Contains("--quick") ? 200 : 1000, After("--dump"));
            return 0;
        }
        int repeats = args.Contains("--quick") ? 3 : 7;
        var catalog = CatalogLocator.Ensure();
        Console.WriteLine($"machine: {Environment.ProcessorCount} cores, .NET {Environment.Version}; median of {repeats} runs");
        var native = NativeYardstick.Run(args);
        foreach (var preset in new[] { "hh1952", "cortex-rs2008" })
        {
            var cell = new CompiledCell(catalog.BuildCell(catalog.Preset(preset)));
            double fiTo = preset == "hh1952" ? 19.375 : 4.0;
            Console.WriteLine($"\n== {preset} ({cell.GateCount} gates, {cell.ChannelCount} channels) ==");
            Simulator.Run(cell, Protocols.Step(10, 0, 1000), 1000, SimulationSettings.SpikesOnly); // warm-up and rate tables
            double single = Median(repeats, () => Simulator.Run(cell, Protocols.Step(fiTo / 2, 0, 1000), 1000, SimulationSettings.SpikesOnly));
            double fi = Median(repeats, () => FiCurve.Measure(cell, 0, fiTo, 32, 1000));
            double gateNs = single * 1e6 / (40000.0 * cell.GateCount);
            double fiGateNs = fi * 1e6 / (32 * 44800.0 * cell.GateCount); // FiCurve adds 100 ms before and 20 ms after each 1 s step
            Console.WriteLine($"one 1 s run at 25 us: {single:F2} ms ({gateNs:F2} ns per gate update, one core)");
            Console.WriteLine($"f-I 32 steps x 1 s (0 to {fiTo} uA/cm2): {fi:F1} ms (target <= 100 ms; " +
                $"{fiGateNs:F2} ns per gate update over all cores, target <= 5 ns)");
            if (preset == "hh1952" && native is { } n)
            {
                Console.WriteLine($"native C yardstick, same f-I workload: direct exp {n.DirectMs:F1} ms, rate tables {n.TableMs:F1} ms");
                Console.WriteLine($"ratio ExprModel / native (tables): {fi / n.TableMs:F2}  (below 1 = faster than native)");
                Console.WriteLine($"ratio ExprModel / native (direct exp): {fi / n.DirectMs:F2}");
            }
            // Speed-up over the reference at equal spike-time accuracy (0.1 ms over 1 s): the fast step that reaches
            // it is the one the accuracy tests use; the reference runs RK4 at 1 us.
            double dt = preset == "hh1952" ? 0.01 : 0.008;
            var step = Protocols.Step(preset == "hh1952" ? 10 : 2, 100, 1000);
            double fastAcc = Median(repeats, () => Simulator.Run(cell, step, 1100, new SimulationSettings { DtMs = dt, RecordEvery = 0 }));
            double refMs = Median(1, () => ReferenceIntegrator.Run(cell, step, 1100, 0.001, 0));
            Console.WriteLine($"equal accuracy (0.1 ms spike times over 1 s): fast at {dt} ms step {fastAcc:F1} ms vs reference RK4 at 1 us {refMs:F0} ms: " +
                $"speed-up {refMs / fastAcc:F0}x");
        }
        return 0;
    }

    internal static double Median(int repeats, Action a)
    {
        var t = new double[repeats];
        for (int i = 0; i < repeats; i++)
        {
            var sw = Stopwatch.StartNew();
            a();
            t[i] = sw.Elapsed.TotalMilliseconds;
        }
        Array.Sort(t);
        return t[repeats / 2];
    }
}

/// <summary>Builds and runs ../shared/bench/hh_native.c (gcc -O3 -march=native) and parses its two timings.</summary>
internal static class NativeYardstick
{
    public sealed record Result(double DirectMs, double TableMs);

    public static Result? Run(string[] args)
    {
        string? source = FindSource();
        if (source is null) { Console.WriteLine("native yardstick: ../shared/bench/hh_native.c not found; skipped"); return null; }
        string exe = Path.Combine(Path.GetTempPath(), "exprmodel_hh_native");
        var build = Process.Start(new ProcessStartInfo("gcc", $"-O3 -march=native -o {exe} {source} -lm") { RedirectStandardError = true });
        build!.WaitForExit();
        if (build.ExitCode != 0) { Console.WriteLine("native yardstick: gcc failed: " + build.StandardError.ReadToEnd()); return null; }
        var run = Process.Start(new ProcessStartInfo(exe) { RedirectStandardOutput = true })!;
        string output = run.StandardOutput.ReadToEnd();
        run.WaitForExit();
        Console.Write("native yardstick output:\n" + output);
        double Parse(string label)
        {
            var line = output.Split('\n').First(l => l.StartsWith(label, StringComparison.Ordinal));
            var i = line.IndexOf(" in ", StringComparison.Ordinal) + 4;
            return double.Parse(line[i..line.IndexOf(" ms", i, StringComparison.Ordinal)], CultureInfo.InvariantCulture);
        }
        return new Result(Parse("direct exp"), Parse("tables"));
    }

    private static string? FindSource()
    {
        for (var d = new DirectoryInfo(Directory.GetCurrentDirectory()); d is not null; d = d.Parent)
        {
            var c = Path.Combine(d.FullName, "shared", "bench", "hh_native.c");
            if (File.Exists(c)) return c;
            c = Path.Combine(d.FullName, "..", "shared", "bench", "hh_native.c");
            if (File.Exists(c)) return Path.GetFullPath(c);
        }
        return null;
    }
}
