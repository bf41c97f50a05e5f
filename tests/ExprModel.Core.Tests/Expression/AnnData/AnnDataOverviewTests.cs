using ExprModel.Core.Expression;
using ExprModel.Core.Expression.AnnData;

namespace ExprModel.Core.Tests.Expression.AnnData;

/// <summary>
/// <see cref="AnnDataReader.Describe"/>: every matrix a user can pick (X, each layer, raw/X), judged on its first
/// values against the seeded MathNet.Numerics matrix the file was written from, and the reader's own hint.
/// </summary>
public sealed class AnnDataOverviewTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    private static readonly SeededMatrix M = CellRangeTests.Matrix;

    [Fact]
    public void ListsXTheLayersAndRaw_AndGivesTheReadersHintForLogValuesInX()
    {
        var path = M.WriteH5ad(Path.Combine(_files.Dir, "atlas.h5ad"), M.SparseGroup(csr: true, transform: v => Math.Log(1 + v)),
            layers: new PureHDF.H5Group { ["spliced"] = M.SparseGroup(csr: false, transform: v => v / 2), ["counts"] = M.SparseGroup(csr: true) },
            raw: M.RawGroup());
        var o = AnnDataReader.Describe(path);
        Assert.Equal((M.Cells, M.Genes), (o.Cells, o.Genes));
        Assert.Equal(["X", "layer:counts", "layer:spliced", "raw"], o.Matrices.Select(m => m.Choice.Spelling));
        Assert.Equal(["csr_matrix", "csr_matrix", "csc_matrix", "csr_matrix"], o.Matrices.Select(m => m.Layout));
        Assert.All(o.Matrices, m => Assert.Equal([M.Cells, M.Genes], m.Shape!));
        // The largest count of the seeded matrix (every stored value is looked at: the matrix is smaller than the sample).
        double largest = M.Values.Enumerate().Max();
        Assert.True(M.Values.NonZerosCount <= 65_536);
        Assert.Equal(largest, o.Matrices[1].Largest);
        Assert.Equal(Math.Log(1 + largest), o.Matrices[0].Largest, 1e-6);
        Assert.Equal([false, true, false, true], o.Matrices.Select(m => m.LooksLikeCounts));
        Assert.Equal("layer:counts", o.Suggested?.Spelling);
        var refusal = Assert.Throws<ExpressionFormatException>(() => ExpressionReader.Read(path, new() { KeepGene = SeededMatrix.Kept }));
        Assert.Equal(refusal.Message, o.Hint);
    }

    [Fact]
    public void CountsInX_OrNoCountsElsewhere_GiveNoHint()
    {
        var counts = AnnDataReader.Describe(M.WriteH5ad(Path.Combine(_files.Dir, "counts.h5ad"), M.Dense()));
        Assert.Equal(["X"], counts.Matrices.Select(m => m.Choice.Spelling));
        Assert.Equal("dense", counts.Matrices[0].Layout);
        Assert.True(counts.Matrices[0].LooksLikeCounts);
        Assert.Null(counts.Hint);
        var logOnly = AnnDataReader.Describe(M.WriteH5ad(Path.Combine(_files.Dir, "log.h5ad"), M.SparseGroup(csr: true, transform: v => Math.Log(1 + v))));
        Assert.Null(logOnly.Hint);
        Assert.Null(logOnly.Suggested);
    }

    [Fact]
    public void NotAnHdf5File_IsNamed()
    {
        var path = Path.Combine(_files.Dir, "table.h5ad");
        File.WriteAllText(path, "gene,c1\nKcnc1,3\n");
        var e = Assert.Throws<ExpressionFormatException>(() => AnnDataReader.Describe(path));
        Assert.Equal("table.h5ad: byte 0: not an HDF5 file (no HDF5 signature), so not an .h5ad file.", e.Message);
    }
}
