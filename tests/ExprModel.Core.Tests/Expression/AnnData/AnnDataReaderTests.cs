using ExprModel.Core.Expression;
using ExprModel.Core.Expression.AnnData;
using PureHDF;
using PureHDF.Filters;
using PureHDF.VOL.Native;

namespace ExprModel.Core.Tests.Expression.AnnData;

/// <summary>
/// h5ad files are written here with PureHDF following the AnnData on-disk layout (anndata documentation, "On-disk
/// format": X dense or a csr_matrix/csc_matrix group with data, indices, indptr and a shape attribute; obs/var data
/// frames with an _index attribute naming the index dataset; categoricals as codes + categories).
/// </summary>
public sealed class AnnDataReaderTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    // Cells x genes, the same numbers as the delimited tests: cell sums by hand 17, 8, 8.
    internal static readonly string[] Cells = ["c1", "c2", "c3"];
    internal static readonly string[] Genes = ["Scn1a", "Kcnc1", "Gapdh", "Actb"];
    internal static readonly float[,] Dense = { { 5, 0, 2, 10 }, { 1, 3, 0, 4 }, { 0, 0, 7, 1 } };

    internal static H5Group Frame(string[] index, params (string Name, object Value)[] columns)
    {
        var g = new H5Group
        {
            ["_index"] = index,
            Attributes = new() { ["_index"] = "_index", ["encoding-type"] = "dataframe", ["encoding-version"] = "0.2.0" },
        };
        foreach (var (name, value) in columns) g[name] = value;
        return g;
    }

    internal static H5Group Csr()
    {
        // Row-compressed form of Dense, written out by hand.
        var data = new float[] { 5, 2, 10, 1, 3, 4, 7, 1 };
        var indices = new int[] { 0, 2, 3, 0, 1, 3, 2, 3 };
        var indptr = new long[] { 0, 3, 6, 8 };
        return new H5Group
        {
            ["data"] = data,
            ["indices"] = indices,
            ["indptr"] = indptr,
            Attributes = new() { ["encoding-type"] = "csr_matrix", ["encoding-version"] = "0.1.0", ["shape"] = new long[] { 3, 4 } },
        };
    }

    internal static H5Group Categorical(sbyte[] codes, string[] categories) => new()
    {
        ["codes"] = codes,
        ["categories"] = categories,
        Attributes = new() { ["encoding-type"] = "categorical", ["encoding-version"] = "0.2.0", ["ordered"] = false },
    };

    private string Write(string name, object x)
    {
        var path = Path.Combine(_files.Dir, name);
        var file = new H5File
        {
            ["X"] = x,
            ["obs"] = Frame(Cells,
                ("group", Categorical([0, 1, 0], ["fast", "adapting"])),
                ("rheobase_pA", new double[] { 50, double.NaN, 120 })),
            ["var"] = Frame(Genes, ("symbol_upper", Genes.Select(g => g.ToUpperInvariant()).ToArray())),
            Attributes = new() { ["encoding-type"] = "anndata", ["encoding-version"] = "0.1.0" },
        };
        file.Write(path);
        return path;
    }

    [Fact]
    public void ReadsDenseX()
    {
        var t = ExpressionReader.Read(Write("dense.h5ad", Dense), new() { KeepGene = g => g is "Scn1a" or "Kcnc1" });
        Assert.Equal(Cells, t.CellIds);
        Assert.Equal([5.0, 1, 0], t.Genes["Scn1a"]);
        Assert.Equal([0.0, 3, 0], t.Genes["Kcnc1"]);
        Assert.Equal([17.0, 8, 8], t.LibrarySizes);
        Assert.Equal(4, t.TotalGeneCount);
        Assert.Equal(ExpressionUnit.Counts, t.Unit);
        Assert.Contains("dense", t.FormatNote);
    }

    [Fact]
    public void ReadsCsrX()
    {
        var t = AnnDataReader.Read(Write("csr.h5ad", Csr()), new() { KeepGene = g => g is "Scn1a" or "Actb" });
        Assert.Equal([5.0, 1, 0], t.Genes["Scn1a"]);
        Assert.Equal([10.0, 4, 1], t.Genes["Actb"]);
        Assert.Equal([17.0, 8, 8], t.LibrarySizes);
        Assert.Contains("csr_matrix", t.FormatNote);
    }

    [Fact]
    public void ReadsCscX()
    {
        // Column-compressed form of Dense: per gene, the cells holding a non-zero.
        var csc = new H5Group
        {
            ["data"] = new float[] { 5, 1, 3, 2, 7, 10, 4, 1 },
            ["indices"] = new int[] { 0, 1, 1, 0, 2, 0, 1, 2 },
            ["indptr"] = new long[] { 0, 2, 3, 5, 8 },
            Attributes = new() { ["encoding-type"] = "csc_matrix", ["encoding-version"] = "0.1.0", ["shape"] = new long[] { 3, 4 } },
        };
        var t = AnnDataReader.Read(Write("csc.h5ad", csc));
        Assert.Equal([5.0, 1, 0], t.Genes["Scn1a"]);
        Assert.Equal([2.0, 0, 7], t.Genes["Gapdh"]);
        Assert.Equal([17.0, 8, 8], t.LibrarySizes);
    }

    [Fact]
    public void ObsColumns_BecomeLabelsAndRecordedReadouts()
    {
        var m = AnnDataReader.ReadCellMetadata(Write("obs.h5ad", Dense));
        Assert.Equal(Cells, m.CellIds);
        Assert.Equal(new string?[] { "fast", "adapting", "fast" }, m.Labels["group"]);
        var rheobase = Assert.Single(m.Recorded);
        Assert.Equal("rheobase", rheobase.Name);
        Assert.Equal("pA", rheobase.Unit);
        Assert.Equal([50.0, null, 120.0], rheobase.Values);
    }

    [Fact]
    public void ReadsChunkedDeflateCompressedX()
    {
        // Writers commonly store X chunked and gzip (deflate) compressed; slices must cross chunk boundaries.
        var creation = new H5DatasetCreation { Filters = [DeflateFilter.Id] };
        var x = new H5Dataset(Dense, chunks: [2, 3], datasetCreation: creation);
        var t = AnnDataReader.Read(Write("chunked.h5ad", x), new() { KeepGene = g => g is "Gapdh" or "Actb" });
        Assert.Equal([2.0, 0, 7], t.Genes["Gapdh"]);
        Assert.Equal([10.0, 4, 1], t.Genes["Actb"]);
        Assert.Equal([17.0, 8, 8], t.LibrarySizes);
    }

    [Fact]
    public void GeneColumn_ReplacesTheVarIndex()
    {
        var t = AnnDataReader.Read(Write("col.h5ad", Dense), new() { GeneColumn = "symbol_upper", KeepGene = g => g == "SCN1A" });
        Assert.Equal([5.0, 1, 0], t.Genes["SCN1A"]);
    }
}
