using System.Globalization;
using PureHDF;
using PureHDF.Filters;
using PureHDF.VOL.Native;

namespace ExprModel.Data.Demo;

/// <summary>
/// The demo counts (<see cref="DemoDataGenerator"/>'s counts.csv) written again as an AnnData .h5ad file laid out the
/// way atlases are usually shared (common practice): X holds normalised, log-transformed values, ln(1 + 10,000 x count
/// / library size) as float32, and the counts themselves sit in the layer <c>layers/counts</c>. Both are CSR sparse
/// groups (cells as rows, genes sorted within a row) with deflate-compressed chunks; obs and var are data frames whose
/// index names the cells and the genes (in the table's order, awkward rows kept, as in the Matrix Market triple). It is
/// written with PureHDF, the HDF5 library the project reads with. Nothing is drawn here: the values are the seeded table's.
/// </summary>
public static class DemoAnnData
{
    /// <summary>The folder under catalog/demo/ that holds the file, and its name.</summary>
    public const string FolderName = "h5ad";
    public const string FileName = "demo.h5ad";

    /// <summary>The layer holding the counts, and the library size X is normalised to (common practice: 10,000).</summary>
    public const string CountsLayer = "counts";
    public const double NormalisedTotal = 10_000;

    /// <summary>Values per compressed chunk: small enough that the file holds several chunks per dataset.</summary>
    private const int ChunkElements = 4096;

    /// <summary>The seeded demo counts as genes, cells and a cells x genes sparse matrix in CSR form.</summary>
    public sealed record Csr(string[] Genes, string[] Cells, float[] Counts, float[] LogNormalised, int[] Indices, long[] Pointers);

    /// <summary>Converts a genes x cells CSV of whole counts (the demo's counts.csv) to CSR rows of cells.</summary>
    public static Csr FromCountsCsv(string countsCsv)
    {
        var lines = countsCsv.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l => l.TrimEnd('\r')).ToArray();
        var cells = lines[0].Split(',')[1..];
        var genes = new string[lines.Length - 1];
        var values = new long[cells.Length, genes.Length];
        for (int row = 1; row < lines.Length; row++)
        {
            var fields = lines[row].Split(',');
            if (fields.Length != cells.Length + 1)
                throw new FormatException($"counts: line {row + 1} has {fields.Length} fields where the header has {cells.Length + 1}.");
            genes[row - 1] = fields[0];
            for (int c = 1; c < fields.Length; c++) values[c - 1, row - 1] = long.Parse(fields[c], NumberStyles.None, CultureInfo.InvariantCulture);
        }
        var (counts, logs, indices, pointers) = (new List<float>(), new List<float>(), new List<int>(), new List<long> { 0 });
        for (int c = 0; c < cells.Length; c++)
        {
            // The library size counts every row, the duplicated one included, as the readers do.
            double library = 0;
            for (int g = 0; g < genes.Length; g++) library += values[c, g];
            for (int g = 0; g < genes.Length; g++)
            {
                if (values[c, g] == 0) continue;
                counts.Add(values[c, g]);
                logs.Add((float)Math.Log(1 + NormalisedTotal * values[c, g] / library));
                indices.Add(g);
            }
            pointers.Add(counts.Count);
        }
        return new Csr(genes, cells, [.. counts], [.. logs], [.. indices], [.. pointers]);
    }

    /// <summary>The seeded demo dataset's matrices.</summary>
    public static Csr Generate(int seed = DemoDataGenerator.DefaultSeed) => FromCountsCsv(DemoDataGenerator.Generate(seed).CountsCsv);

    /// <summary>Writes <see cref="FileName"/> into <paramref name="directory"/> (created if needed) and returns its path.</summary>
    public static string WriteTo(string directory, int seed = DemoDataGenerator.DefaultSeed)
    {
        Directory.CreateDirectory(directory);
        var m = Generate(seed);
        var path = Path.Combine(directory, FileName);
        var file = new H5File
        {
            ["X"] = Sparse(m, m.LogNormalised),
            ["layers"] = new H5Group { [CountsLayer] = Sparse(m, m.Counts) },
            ["obs"] = Frame(m.Cells),
            ["var"] = Frame(m.Genes),
            Attributes = new() { ["encoding-type"] = "anndata", ["encoding-version"] = "0.1.0" },
        };
        // Written beside the target and moved over it, so a failed write never leaves half a file in catalog/demo.
        var temporary = path + ".tmp";
        file.Write(temporary);
        File.Move(temporary, path, overwrite: true);
        return path;
    }

    private static H5Group Sparse(Csr m, float[] data) => new()
    {
        ["data"] = Chunked(data),
        ["indices"] = Chunked(m.Indices),
        ["indptr"] = Chunked(m.Pointers),
        Attributes = new()
        {
            ["encoding-type"] = "csr_matrix",
            ["encoding-version"] = "0.1.0",
            ["shape"] = new long[] { m.Cells.Length, m.Genes.Length },
        },
    };

    private static H5Group Frame(string[] index) => new()
    {
        ["_index"] = index,
        Attributes = new() { ["_index"] = "_index", ["encoding-type"] = "dataframe", ["encoding-version"] = "0.2.0" },
    };

    private static H5Dataset Chunked<T>(T[] values) => new(values, chunks: [(uint)Math.Clamp(values.Length, 1, ChunkElements)],
        datasetCreation: new H5DatasetCreation { Filters = [DeflateFilter.Id] });
}
