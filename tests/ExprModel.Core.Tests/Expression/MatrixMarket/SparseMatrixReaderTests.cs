using ExprModel.Core.Expression;
using ExprModel.Core.Expression.MatrixMarket;

namespace ExprModel.Core.Tests.Expression.MatrixMarket;

public sealed class SparseMatrixReaderTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    // The same 4-gene x 3-cell table as the delimited tests, as a Matrix Market coordinate matrix (NIST Matrix
    // Market exchange format: banner, size line "rows columns entries", then 1-based "row column value" lines in any
    // order). Column sums by hand: c1 = 17, c2 = 8, c3 = 8.
    private const string Matrix =
        "%%MatrixMarket matrix coordinate integer general\n% a comment\n4 3 8\n1 1 5\n1 2 1\n2 2 3\n3 1 2\n3 3 7\n4 1 10\n4 2 4\n4 3 1\n";
    private const string Features = "ENSMUSG00000064329\tScn1a\tGene Expression\nENSMUSG00000041063\tKcnc1\tGene Expression\n"
        + "ENSMUSG00000057666\tGapdh\tGene Expression\nENSMUSG00000029580\tActb\tGene Expression\n";
    private const string Barcodes = "AAACCTGAGAAGGCCT-1\nAAACCTGAGCATCATC-1\nAAACCTGCAGGTGCCT-1\n";

    private string Layout(string sub, bool gzip)
    {
        string ext = gzip ? ".gz" : "";
        _files.Text($"{sub}/matrix.mtx{ext}", Matrix, gzip: gzip);
        _files.Text($"{sub}/features.tsv{ext}", Features, gzip: gzip);
        _files.Text($"{sub}/barcodes.tsv{ext}", Barcodes, gzip: gzip);
        return Path.Combine(_files.Dir, sub);
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void ReadsDirectoryLayout(bool gzip)
    {
        var t = ExpressionReader.Read(Layout("m" + gzip, gzip), new() { KeepGene = g => g is "Scn1a" or "Kcnc1" });
        Assert.Equal(["AAACCTGAGAAGGCCT-1", "AAACCTGAGCATCATC-1", "AAACCTGCAGGTGCCT-1"], t.CellIds);
        Assert.Equal([5.0, 1, 0], t.Genes["Scn1a"]);
        Assert.Equal([0.0, 3, 0], t.Genes["Kcnc1"]);
        Assert.Equal([17.0, 8, 8], t.LibrarySizes);
        Assert.Equal(4, t.TotalGeneCount);
        Assert.Equal(ExpressionUnit.Counts, t.Unit);
        Assert.Contains("Matrix Market", t.FormatNote);
    }

    [Fact]
    public void FeatureColumnOne_GivesEnsemblIds()
    {
        var t = SparseMatrixReader.Read(Layout("ids", false), new() { FeatureColumn = 1, KeepGene = g => g == "ENSMUSG00000064329" });
        Assert.Equal([5.0, 1, 0], t.Genes["ENSMUSG00000064329"]);
    }

    [Fact]
    public void MatrixFilePath_FindsSidecarsBesideIt()
    {
        var dir = Layout("byfile", false);
        var t = ExpressionReader.Read(Path.Combine(dir, "matrix.mtx"), new() { KeepGene = g => g == "Actb" });
        Assert.Equal([10.0, 4, 1], t.Genes["Actb"]);
    }
}
