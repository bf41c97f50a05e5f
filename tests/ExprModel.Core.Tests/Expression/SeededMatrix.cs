using System.Globalization;
using System.Text;
using MathNet.Numerics.LinearAlgebra.Double;
using PureHDF;
using PureHDF.Filters;
using PureHDF.VOL.Native;

namespace ExprModel.Core.Tests.Expression;

/// <summary>
/// A seeded sparse count matrix (cells x genes) held as a MathNet.Numerics sparse matrix, the outside reference the
/// ranged-read tests compare against (its row slices and row sums), and writers of the same numbers in every format
/// the readers take: h5ad (AnnData on-disk layout: csr_matrix, csc_matrix or dense X, chunked and deflate-compressed),
/// a Matrix Market directory (genes as rows) and delimited text in both orientations.
/// </summary>
internal sealed class SeededMatrix
{
    public int Cells { get; }
    public int Genes { get; }
    public SparseMatrix Values { get; }
    public string[] CellIds { get; }
    public string[] GeneIds { get; }

    public SeededMatrix(int cells, int genes, int perCell, int seed)
    {
        (Cells, Genes) = (cells, genes);
        var rng = new Random(seed);
        Values = new SparseMatrix(cells, genes);
        for (int c = 0; c < cells; c++)
            for (int k = 0; k < perCell; k++) Values[c, rng.Next(genes)] = 1 + rng.Next(40);
        CellIds = Enumerable.Range(0, cells).Select(i => $"cell{i:D5}").ToArray();
        GeneIds = Enumerable.Range(0, genes).Select(i => $"G{i:D5}").ToArray();
    }

    /// <summary>Genes a test keeps: every seventh.</summary>
    public static bool Kept(string gene) => int.Parse(gene[1..], CultureInfo.InvariantCulture) % 7 == 0;

    private static H5Group Frame(string[] index) => new()
    {
        ["_index"] = index,
        Attributes = new() { ["_index"] = "_index", ["encoding-type"] = "dataframe", ["encoding-version"] = "0.2.0" },
    };

    private static H5Dataset Chunked<T>(T[] values) => new(values, chunks: [(uint)Math.Clamp(values.Length, 1, 4096)],
        datasetCreation: new H5DatasetCreation { Filters = [DeflateFilter.Id] });

    /// <summary>The matrix as an AnnData sparse group (CSR: rows are cells; CSC: columns are genes).</summary>
    public H5Group SparseGroup(bool csr, Func<double, double>? transform = null)
    {
        var storage = csr ? Values : (SparseMatrix)Values.Transpose();
        var data = new List<float>();
        var indices = new List<int>();
        var indptr = new List<long> { 0 };
        for (int r = 0; r < storage.RowCount; r++)
        {
            foreach (var (col, v) in storage.Row(r).EnumerateIndexed(MathNet.Numerics.LinearAlgebra.Zeros.AllowSkip).OrderBy(t => t.Item1))
            {
                data.Add((float)(transform?.Invoke(v) ?? v));
                indices.Add(col);
            }
            indptr.Add(data.Count);
        }
        return new H5Group
        {
            ["data"] = Chunked(data.ToArray()),
            ["indices"] = Chunked(indices.ToArray()),
            ["indptr"] = Chunked(indptr.ToArray()),
            Attributes = new()
            {
                ["encoding-type"] = csr ? "csr_matrix" : "csc_matrix",
                ["encoding-version"] = "0.1.0",
                ["shape"] = new long[] { Cells, Genes },
            },
        };
    }

    public H5Dataset Dense()
    {
        var a = new float[Cells, Genes];
        for (int c = 0; c < Cells; c++)
            for (int g = 0; g < Genes; g++) a[c, g] = (float)Values[c, g];
        return new H5Dataset(a, chunks: [64, (uint)Math.Min(Genes, 256)], datasetCreation: new H5DatasetCreation { Filters = [DeflateFilter.Id] });
    }

    public string WriteH5ad(string path, object x, H5Group? layers = null, H5Group? raw = null)
    {
        var file = new H5File
        {
            ["X"] = x,
            ["obs"] = Frame(CellIds),
            ["var"] = Frame(GeneIds),
            Attributes = new() { ["encoding-type"] = "anndata", ["encoding-version"] = "0.1.0" },
        };
        if (layers is not null) file["layers"] = layers;
        if (raw is not null) file["raw"] = raw;
        file.Write(path);
        return path;
    }

    /// <summary>A raw group: raw/X holding the counts, raw/var naming its genes.</summary>
    public H5Group RawGroup() => new() { ["X"] = SparseGroup(csr: true), ["var"] = Frame(GeneIds) };

    /// <summary>Writes matrix.mtx (genes as rows, cells as columns; entries in a shuffled order), features.tsv and barcodes.tsv.</summary>
    public string WriteMatrixMarket(string dir)
    {
        Directory.CreateDirectory(dir);
        var entries = Values.EnumerateIndexed(MathNet.Numerics.LinearAlgebra.Zeros.AllowSkip).ToList();
        var rng = new Random(5);
        var sb = new StringBuilder("%%MatrixMarket matrix coordinate integer general\n");
        sb.Append(CultureInfo.InvariantCulture, $"{Genes} {Cells} {entries.Count}\n");
        foreach (var (c, g, v) in entries.OrderBy(_ => rng.Next()))
            sb.Append(CultureInfo.InvariantCulture, $"{g + 1} {c + 1} {v}\n");
        File.WriteAllText(Path.Combine(dir, "matrix.mtx"), sb.ToString());
        File.WriteAllLines(Path.Combine(dir, "features.tsv"), GeneIds.Select(g => $"ENSG_{g}\t{g}\tGene Expression"));
        File.WriteAllLines(Path.Combine(dir, "barcodes.tsv"), CellIds);
        return dir;
    }

    public string WriteCsv(string path, bool cellsAsRows)
    {
        var sb = new StringBuilder();
        var (rows, cols) = cellsAsRows ? (CellIds, GeneIds) : (GeneIds, CellIds);
        sb.Append("id,").AppendJoin(',', cols).Append('\n');
        for (int r = 0; r < rows.Length; r++)
        {
            sb.Append(rows[r]);
            for (int c = 0; c < cols.Length; c++)
                sb.Append(',').Append((cellsAsRows ? Values[r, c] : Values[c, r]).ToString(CultureInfo.InvariantCulture));
            sb.Append('\n');
        }
        File.WriteAllText(path, sb.ToString());
        return path;
    }
}
