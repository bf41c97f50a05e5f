using System.Diagnostics;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Data.Catalog;

namespace ExprModel.Benchmarks;

/// <summary>
/// "batch": the standard batch read-outs for 1,000 cells (target: 60 s on this 2-core machine). The cells are the
/// demo dataset's cells resampled with a fixed seed (binomial thinning of their counts), so every model differs.
/// </summary>
public static class BatchBenchmark
{
    public static void Run(int cells)
    {
        var catalog = CatalogLocator.Ensure();
        var mapping = catalog.ForMapping();
        var dir = CatalogLocator.FindSourceDirectory() ?? throw new InvalidOperationException("catalog/ not found");
        var resolver = new GeneResolver(mapping.Links, mapping.Statuses, mapping.Identifiers);
        var demo = ExpressionReader.Read(Path.Combine(dir, "demo", "counts.csv"), new ExpressionReadOptions { KeepGene = resolver.Knows });
        var rng = new Random(20261201);
        var ids = new string[cells];
        var genes = demo.Genes.ToDictionary(g => g.Key, _ => new double[cells]);
        var lib = new double[cells];
        for (int c = 0; c < cells; c++)
        {
            int src = rng.Next(demo.CellIds.Count);
            ids[c] = $"{demo.CellIds[src]}-r{c}";
            double keep = 0.5 + 0.5 * rng.NextDouble();
            foreach (var (g, v) in demo.Genes)
            {
                int n = (int)v[src], k = 0;
                for (int j = 0; j < n; j++) if (rng.NextDouble() < keep) k++;
                genes[g][c] = k;
            }
            lib[c] = demo.LibrarySizes[src] * keep;
        }
        var table = new ExpressionTable
        {
            Source = $"demo resampled to {cells} cells",
            CellIds = ids,
            Genes = genes,
            LibrarySizes = lib,
            TotalGeneCount = demo.TotalGeneCount,
            Unit = ExpressionUnit.Counts,
            UnitNote = "counts",
            Orientation = TableOrientation.GenesAsRows,
            OrientationNote = "built in memory",
        };
        var report = ExpressionMapping.Map(table, mapping);
        var targets = ids.Select(ModelTarget.ForCell).ToArray();
        var proc = Process.GetCurrentProcess();
        var cpu0 = proc.TotalProcessorTime;
        var sw = Stopwatch.StartNew();
        var rows = BatchReadouts.Run(table, report, mapping, new DensityRule(), targets, null, 0, cells);
        sw.Stop();
        proc.Refresh();
        double cpuS = (proc.TotalProcessorTime - cpu0).TotalSeconds;
        int failed = rows.Count(r => r.Readouts is null);
        foreach (var f in rows.Where(r => r.Readouts is null).Take(3)) Console.WriteLine($"  failed {f.Item}: {f.Warnings}");
        int firing = rows.Count(r => r.Readouts?.RheobasePa is not null);
        Console.WriteLine($"batch: {cells} cells, {report.Genes.Count} mapped genes, standard read-outs in {sw.Elapsed.TotalSeconds:F1} s wall " +
            $"({sw.Elapsed.TotalMilliseconds / cells:F1} ms per cell; target 60 s for 1,000); {firing} fire, {failed} failed");
        Console.WriteLine($"  process CPU {cpuS:F1} s = {cpuS / Environment.ProcessorCount:F1} s on {Environment.ProcessorCount} cores if nothing else ran; " +
            $"load average now {File.ReadAllText("/proc/loadavg").Split(' ')[0]}");
    }
}
