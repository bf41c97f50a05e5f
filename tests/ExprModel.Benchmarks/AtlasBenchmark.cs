using System.Diagnostics;
using System.Globalization;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Mapping;
using ExprModel.Data.Catalog;
using PureHDF;
using PureHDF.Filters;
using PureHDF.Selections;
using PureHDF.VOL.Native;

namespace ExprModel.Benchmarks;

/// <summary>
/// "atlas": reading an atlas-sized sparse h5ad. A seeded generator writes 200,000 cells x 20,000 genes with about
/// 1,000 non-zero counts per cell (CSR, float32 data and int32 indices in deflate-compressed chunks of 65,536
/// elements, AnnData on-disk layout) to the temp directory once (the name carries seed and size; reused when
/// present). Each measurement runs in a child process so its peak working set is its own: one shard's catalog genes
/// for 1/100 of the cells (targets 5 s and 1 GB), and a full pass keeping the catalog genes (target 3 min).
/// Prints times, peaks and ratios to the targets; never asserted (shared machines). Per-cell read-out cost and
/// projections are the "batch" mode's part of the report.
/// </summary>
public static class AtlasBenchmark
{
    public const int Cells = 200_000, Genes = 20_000, PerCell = 1_000, Seed = 19, ChunkElements = 1 << 16;
    private const double ShardTargetS = 5, ShardTargetMb = 1024, FullTargetS = 180;

    public static string DefaultPath =>
        Path.Combine(Path.GetTempPath(), $"exprmodel-atlas-{Cells}x{Genes}-nnz{PerCell}-seed{Seed}-chunk{ChunkElements}.h5ad");

    public static void Run(string[] args)
    {
        // Child process: measure one read and print one line.
        int measure = Array.IndexOf(args, "--measure");
        if (measure >= 0) { Measure(args[measure + 1], args[measure + 2]); return; }

        string path = DefaultPath;
        if (!File.Exists(path))
        {
            var sw = Stopwatch.StartNew();
            Generate(path);
            Console.WriteLine($"generated {path} in {sw.Elapsed.TotalSeconds:F0} s");
        }
        Console.WriteLine($"atlas file: {path}, {new FileInfo(path).Length / 1e9:F2} GB, {Cells:N0} cells x {Genes:N0} genes, " +
            $"~{PerCell} non-zeros per cell (CSR, deflate chunks of {ChunkElements:N0} elements); machine: {Environment.ProcessorCount} cores");
        var shard = Child("shard", path);
        var full = Child("full", path);
        Console.WriteLine($"shard (cells 1/100, catalog genes): {shard.Seconds:F2} s (target <= {ShardTargetS} s, ratio {shard.Seconds / ShardTargetS:F2}); " +
            $"peak {shard.PeakMb:F0} MB (target <= {ShardTargetMb} MB, ratio {shard.PeakMb / ShardTargetMb:F2}); {shard.Detail}");
        Console.WriteLine($"full pass (all cells, catalog genes): {full.Seconds:F1} s (target <= {FullTargetS} s, ratio {full.Seconds / FullTargetS:F2}); " +
            $"peak {full.PeakMb:F0} MB; {full.Detail}");
        Console.WriteLine($"reading per cell: shard {shard.Seconds / (Cells / 100.0) * 1e3:F3} ms, full pass {full.Seconds / Cells * 1e3:F3} ms " +
            "(add to the per-cell read-out cost of the batch mode for a projection)");
    }

    private sealed record Result(double Seconds, double PeakMb, string Detail);

    private static Result Child(string what, string path)
    {
        var psi = new ProcessStartInfo(Environment.ProcessPath!) { RedirectStandardOutput = true, UseShellExecute = false };
        // Started as "dotnet ExprModel.Benchmarks.dll": the child needs the assembly as its first argument too.
        if (Path.GetFileNameWithoutExtension(Environment.ProcessPath) == "dotnet") psi.ArgumentList.Add(typeof(AtlasBenchmark).Assembly.Location);
        foreach (var a in new[] { "atlas", "--measure", what, path }) psi.ArgumentList.Add(a);
        using var p = Process.Start(psi)!;
        string output = p.StandardOutput.ReadToEnd();
        p.WaitForExit();
        var line = output.Split('\n').FirstOrDefault(l => l.StartsWith("measured ", StringComparison.Ordinal))
            ?? throw new InvalidOperationException($"child '{what}' printed no measurement (exit {p.ExitCode}): {output}");
        var f = line.Split(' ');
        return new Result(double.Parse(f[1], CultureInfo.InvariantCulture), double.Parse(f[2], CultureInfo.InvariantCulture), string.Join(' ', f[3..]));
    }

    /// <summary>The catalog's gene filter, as a batch run uses it (every gene the catalog links or classifies).</summary>
    private static Func<string, bool> CatalogGenes()
    {
        var mapping = CatalogLocator.Ensure().ForMapping();
        return new GeneResolver(mapping.Links, mapping.Statuses, mapping.Identifiers).Knows;
    }

    private static void Measure(string what, string path)
    {
        var keep = CatalogGenes();
        var meter = new ReadMeter();
        var options = new ExpressionReadOptions { KeepGene = keep, Meter = meter, Unit = ExpressionUnit.Counts };
        if (what == "shard") options = options with { Cells = CellRange.Part(37, 100, ExpressionReader.CountCells(path)) };
        var sw = Stopwatch.StartNew();
        var t = ExpressionReader.Read(path, options);
        sw.Stop();
        var proc = Process.GetCurrentProcess();
        proc.Refresh();
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"measured {sw.Elapsed.TotalSeconds:F3} {proc.PeakWorkingSet64 / 1048576.0:F0} {t.CellIds.Count} cells, {t.Genes.Count} genes kept, " +
            $"{meter.BytesRead / 1e6:F0} MB read from the file, {meter.ValuesRead:N0} elements decoded"));
    }

    /// <summary>Gene names: the mouse symbols the catalog links, spread over the gene axis, the rest made up.</summary>
    private static string[] GeneNames()
    {
        var mapping = CatalogLocator.Ensure().ForMapping();
        var channels = mapping.Links.Where(l => l.Species == Species.Mouse).Select(l => l.Symbol).Distinct().Order(StringComparer.Ordinal).ToArray();
        var names = Enumerable.Range(0, Genes).Select(i => $"Gene{i:D5}").ToArray();
        for (int k = 0; k < channels.Length; k++) names[(int)((long)k * Genes / channels.Length) + 7] = channels[k];
        return names;
    }

    /// <summary>
    /// Writes the file with PureHDF's deferred writer: the data and indices datasets are declared with their final
    /// size and filled block by block, each block a whole number of chunks, so memory stays at a few blocks.
    /// </summary>
    private static void Generate(string path)
    {
        // First pass: the row lengths (so the datasets' sizes are known), from the same seeded stream as the second.
        var lengths = new int[Cells];
        var rng = new Random(Seed);
        for (int c = 0; c < Cells; c++) lengths[c] = RowLength(rng);
        var indptr = new long[Cells + 1];
        for (int c = 0; c < Cells; c++) indptr[c + 1] = indptr[c] + lengths[c];
        long nnz = indptr[Cells];

        var creation = new H5DatasetCreation { Filters = [DeflateFilter.Id] };
        var data = new H5Dataset<float[]>(fileDims: [(ulong)nnz], chunks: [ChunkElements], datasetCreation: creation);
        var indices = new H5Dataset<int[]>(fileDims: [(ulong)nnz], chunks: [ChunkElements], datasetCreation: creation);
        static H5Group Frame(string[] index) => new()
        {
            ["_index"] = index,
            Attributes = new() { ["_index"] = "_index", ["encoding-type"] = "dataframe", ["encoding-version"] = "0.2.0" },
        };
        var file = new H5File
        {
            ["X"] = new H5Group
            {
                ["data"] = data,
                ["indices"] = indices,
                ["indptr"] = new H5Dataset(indptr, chunks: [ChunkElements], datasetCreation: creation),
                Attributes = new() { ["encoding-type"] = "csr_matrix", ["encoding-version"] = "0.1.0", ["shape"] = new long[] { Cells, Genes } },
            },
            ["obs"] = Frame(Enumerable.Range(0, Cells).Select(i => $"cell{i:D7}").ToArray()),
            ["var"] = Frame(GeneNames()),
            Attributes = new() { ["encoding-type"] = "anndata", ["encoding-version"] = "0.1.0" },
        };

        string part = path + ".part";
        const int BlockElements = 64 * ChunkElements;
        var dataBlock = new float[BlockElements + 4 * PerCell];
        var indexBlock = new int[BlockElements + 4 * PerCell];
        using (var writer = file.BeginWrite(part))
        {
            rng = new Random(Seed);
            for (int c = 0; c < Cells; c++) RowLength(rng); // the same stream: lengths first, then the values
            int fill = 0;
            long written = 0;
            void Flush(int count)
            {
                var selection = new HyperslabSelection((ulong)written, (ulong)count);
                writer.Write(data, dataBlock[..count], fileSelection: selection);
                writer.Write(indices, indexBlock[..count], fileSelection: selection);
                written += count;
                Array.Copy(dataBlock, count, dataBlock, 0, fill - count);
                Array.Copy(indexBlock, count, indexBlock, 0, fill - count);
                fill -= count;
            }
            for (int c = 0; c < Cells; c++)
            {
                FillRow(rng, lengths[c], dataBlock.AsSpan(fill), indexBlock.AsSpan(fill));
                fill += lengths[c];
                if (fill >= BlockElements) Flush(BlockElements);
            }
            if (fill > 0) Flush(fill);
        }
        File.Move(part, path, overwrite: true);
    }

    /// <summary>About <see cref="PerCell"/> non-zeros (uniform spread of +-20 %).</summary>
    private static int RowLength(Random rng) => PerCell * 4 / 5 + rng.Next(PerCell * 2 / 5 + 1);

    /// <summary>Distinct sorted gene indices spread over the axis, with small counts (1 to 8, mostly 1 or 2).</summary>
    private static void FillRow(Random rng, int n, Span<float> values, Span<int> genes)
    {
        // n positions in n equal strata of the gene axis, one per stratum: distinct and sorted without a sort.
        double stride = (double)Genes / n;
        for (int k = 0; k < n; k++)
        {
            genes[k] = (int)(k * stride + rng.NextDouble() * stride);
            int u = rng.Next(64);
            values[k] = u < 36 ? 1 : u < 52 ? 2 : u < 58 ? 3 : 4 + (u & 3);
        }
    }
}
