using ExprModel.Core.Expression;
using ExprModel.Core.Expression.AnnData;

namespace ExprModel.Core.Tests.Expression.AnnData;

/// <summary>
/// Choosing the AnnData matrix (X, layers/NAME, raw/X with raw/var: the AnnData on-disk layout's own names), and the
/// hint when X holds ln(1 + x) values (the common single-cell transform, common practice) while counts sit elsewhere.
/// </summary>
public sealed class MatrixChoiceTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    private static readonly SeededMatrix M = CellRangeTests.Matrix;

    /// <summary>X holds ln(1 + count), the counts sit in layers/counts and in raw/X.</summary>
    private string AtlasStyle(string name, bool withCounts = true) => M.WriteH5ad(Path.Combine(_files.Dir, name),
        M.SparseGroup(csr: true, transform: v => Math.Log(1 + v)),
        layers: withCounts ? new PureHDF.H5Group { ["counts"] = M.SparseGroup(csr: true) } : null,
        raw: withCounts ? M.RawGroup() : null);

    [Fact]
    public void LogTransformedX_WithCountsInALayer_NamesTheLayerToUse()
    {
        var path = AtlasStyle("atlas.h5ad");
        var e = Assert.Throws<ExpressionFormatException>(() => ExpressionReader.Read(path, new() { KeepGene = SeededMatrix.Kept }));
        Assert.Contains("atlas.h5ad: dataset /X", e.Message);
        Assert.Contains("look log-transformed", e.Message);
        Assert.Contains("layers/counts holds whole numbers: use --matrix layer:counts", e.Message);
    }

    [Fact]
    public void LogTransformedX_WithoutCounts_KeepsTheOldRefusal()
    {
        var path = AtlasStyle("nocounts.h5ad", withCounts: false);
        var e = Assert.Throws<ExpressionFormatException>(() => ExpressionReader.Read(path, new() { KeepGene = SeededMatrix.Kept }));
        Assert.Contains("values look log-transformed", e.Message);
        Assert.DoesNotContain("--matrix", e.Message);
    }

    [Theory]
    [InlineData("layer:counts")]
    [InlineData("raw")]
    public void ChosenCountsMatrix_ReadsLikeAPlainCountsFile(string choice)
    {
        var path = AtlasStyle("atlas.h5ad");
        var matrix = ReadOptionsParser.Matrix(choice);
        var t = ExpressionReader.Read(path, new() { KeepGene = SeededMatrix.Kept, Matrix = matrix });
        CellRangeTests.AssertSlice(M, new CellRange(0, M.Cells), t);
        Assert.Contains(t.Notes, n => n.Contains($"matrix choice '{choice}'"));
        // And a shard of it.
        var range = CellRange.Part(2, 3, M.Cells);
        CellRangeTests.AssertSlice(M, range, ExpressionReader.Read(path, new() { KeepGene = SeededMatrix.Kept, Matrix = matrix, Cells = range }));
    }

    [Fact]
    public void ChosenX_WithTheTransformStated_UndoesIt()
    {
        var path = AtlasStyle("atlas.h5ad");
        var t = ExpressionReader.Read(path, new() { KeepGene = SeededMatrix.Kept, Matrix = MatrixChoice.X, LogTransform = LogTransform.NaturalLog1p });
        // float32 storage of ln(1 + x): the undone counts agree to float precision and are read as counts.
        Assert.Equal(ExpressionUnit.Counts, t.Unit);
        Assert.Equal(M.Values.RowSums()[0], t.LibrarySizes[0], 1e-3);
    }

    [Fact]
    public void AMissingLayer_IsAnErrorListingTheMatrices()
    {
        var path = AtlasStyle("atlas.h5ad");
        var e = Assert.Throws<ExpressionFormatException>(() => ExpressionReader.Read(path, new() { Matrix = MatrixChoice.Layer("spliced") }));
        Assert.Contains("atlas.h5ad: dataset /layers/spliced: missing", e.Message);
        Assert.Contains("the file has: X, layer:counts, raw", e.Message);
    }

    [Theory]
    [InlineData("X", "X")]
    [InlineData(" x ", "X")]
    [InlineData("raw", "raw")]
    [InlineData("raw/X", "raw")]
    [InlineData("layer:counts", "layer:counts")]
    [InlineData("layers/spliced", "layer:spliced")]
    public void Spellings(string text, string spelling) => Assert.Equal(spelling, ReadOptionsParser.Matrix(text)!.Spelling);

    [Theory]
    [InlineData("layer:")]
    [InlineData("layer:a/b")]
    [InlineData("obsm")]
    public void BadSpellings_NameTheFieldAndTheChoices(string text)
    {
        var e = Assert.Throws<ArgumentException>(() => ReadOptionsParser.Parse(null, null, null, "--", text));
        Assert.StartsWith($"--matrix: '{text}' is not X, layer:NAME", e.Message);
    }
}
