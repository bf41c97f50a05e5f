using ExprModel.Core.Expression;

namespace ExprModel.Core.Tests.Expression;

/// <summary>Every spelling the command line, the API and the Load page accept, and the wording of a refusal.</summary>
public class ReadOptionsParserTests
{
    [Theory]
    [InlineData("counts", ExpressionUnit.Counts)]
    [InlineData("count", ExpressionUnit.Counts)]
    [InlineData("raw", ExpressionUnit.Counts)]
    [InlineData("cpm", ExpressionUnit.Cpm)]
    [InlineData("CPM", ExpressionUnit.Cpm)]
    [InlineData("tpm", ExpressionUnit.Tpm)]
    [InlineData(" TPM ", ExpressionUnit.Tpm)]
    [InlineData("fpkm", ExpressionUnit.Fpkm)]
    [InlineData("rpkm", ExpressionUnit.Fpkm)]
    public void LinearUnits(string text, ExpressionUnit unit)
    {
        var o = ReadOptionsParser.Parse(null, text);
        Assert.Equal(unit, o.Unit);
        Assert.Equal(LogTransform.None, o.LogTransform);
    }

    [Theory]
    [InlineData(null)]
    [InlineData("")]
    [InlineData("  ")]
    public void AbsentMeansDetect(string? text)
    {
        var o = ReadOptionsParser.Parse(text, text, text);
        Assert.Null(o.Unit);
        Assert.Null(o.Orientation);
        Assert.Equal(LogTransform.None, o.LogTransform);
    }

    [Fact]
    public void LogTransformedAloneIsNaturalLogOfOnePlus()
    {
        var o = ReadOptionsParser.Parse(null, "log-transformed");
        Assert.Null(o.Unit);
        Assert.Equal(LogTransform.NaturalLog1p, o.LogTransform);
    }

    [Theory]
    [InlineData("ln1p", LogTransform.NaturalLog1p)]
    [InlineData("log2p1", LogTransform.Log2Plus1)]
    [InlineData("LOG10P1", LogTransform.Log10Plus1)]
    public void LogTransforms(string text, LogTransform log)
    {
        Assert.Equal(log, ReadOptionsParser.Parse(null, null, text).LogTransform);
        // A stated transform wins over the ln(1 + x) that "log-transformed" implies.
        Assert.Equal(log, ReadOptionsParser.Parse(null, "log-transformed", text).LogTransform);
        // With a linear unit, the unit is that of the values once the transform is undone.
        var o = ReadOptionsParser.Parse(null, "cpm", text);
        Assert.Equal((ExpressionUnit.Cpm, log), (o.Unit, o.LogTransform));
    }

    [Theory]
    [InlineData("genes-as-rows", TableOrientation.GenesAsRows)]
    [InlineData("Cells-As-Rows", TableOrientation.CellsAsRows)]
    public void Orientations(string text, TableOrientation orientation) =>
        Assert.Equal(orientation, ReadOptionsParser.Parse(text, null).Orientation);

    [Theory]
    [InlineData(null, "umi", null, "", "unit: 'umi' is not counts, cpm, tpm, fpkm or log-transformed.")]
    [InlineData(null, null, "ln", "--", "--log: 'ln' is not ln1p, log2p1 or log10p1.")]
    [InlineData("rows", null, null, "--", "--orientation: 'rows' is not genes-as-rows or cells-as-rows.")]
    [InlineData(null, "log2", null, "--", "--unit: 'log2' is not counts, cpm, tpm, fpkm or log-transformed.")]
    public void RefusalNamesTheFieldTheValueAndTheChoices(string? orientation, string? unit, string? log, string prefix, string message)
    {
        var e = Assert.Throws<ArgumentException>(() => ReadOptionsParser.Parse(orientation, unit, log, prefix));
        Assert.Equal(message, e.Message);
    }
}
