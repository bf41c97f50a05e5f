using ExprModel.Core.Expression;

namespace ExprModel.Core.Tests.Expression;

/// <summary>
/// A read of a cell range equals the full matrix sliced to those cells, in every format, against the MathNet.Numerics
/// sparse matrix the files were written from (its row slice for values, its row sums for library sizes).
/// </summary>
public sealed class CellRangeTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    internal static readonly SeededMatrix Matrix = new(cells: 600, genes: 240, perCell: 25, seed: 11);

    /// <summary>Checks a table read for <paramref name="range"/> against the reference matrix.</summary>
    internal static void AssertSlice(SeededMatrix m, CellRange range, ExpressionTable t)
    {
        Assert.Equal(m.CellIds[range.Start..range.End], t.CellIds);
        var slice = m.Values.SubMatrix(range.Start, range.Count, 0, m.Genes);
        Assert.Equal(slice.RowSums().ToArray(), t.LibrarySizes);
        var kept = m.GeneIds.Where(SeededMatrix.Kept).ToArray();
        Assert.Equal(kept.Order(), t.Genes.Keys.Order());
        foreach (var gene in kept)
            Assert.Equal(slice.Column(Array.IndexOf(m.GeneIds, gene)).ToArray(), t.Genes[gene]);
        Assert.Equal(m.Genes, t.TotalGeneCount);
        Assert.Equal(ExpressionUnit.Counts, t.Unit);
    }

    private string Write(string format) => format switch
    {
        "h5ad-csr" => Matrix.WriteH5ad(Path.Combine(_files.Dir, "csr.h5ad"), Matrix.SparseGroup(csr: true)),
        "h5ad-csc" => Matrix.WriteH5ad(Path.Combine(_files.Dir, "csc.h5ad"), Matrix.SparseGroup(csr: false)),
        "h5ad-dense" => Matrix.WriteH5ad(Path.Combine(_files.Dir, "dense.h5ad"), Matrix.Dense()),
        "mtx" => Matrix.WriteMatrixMarket(Path.Combine(_files.Dir, "mtx")),
        "csv-cells-as-rows" => Matrix.WriteCsv(Path.Combine(_files.Dir, "rows.csv"), cellsAsRows: true),
        "csv-genes-as-rows" => Matrix.WriteCsv(Path.Combine(_files.Dir, "cols.csv"), cellsAsRows: false),
        _ => throw new ArgumentException(format),
    };

    private static TableOrientation? Orientation(string format) => format switch
    {
        "csv-cells-as-rows" => TableOrientation.CellsAsRows,
        "csv-genes-as-rows" => TableOrientation.GenesAsRows,
        _ => null,
    };

    [Theory]
    [InlineData("h5ad-csr")]
    [InlineData("h5ad-csc")]
    [InlineData("h5ad-dense")]
    [InlineData("mtx")]
    [InlineData("csv-cells-as-rows")]
    [InlineData("csv-genes-as-rows")]
    public void EveryShardOfEveryFormat_EqualsTheMatrixSlicedToItsCells(string format)
    {
        var path = Write(format);
        var options = new ExpressionReadOptions { KeepGene = SeededMatrix.Kept, Orientation = Orientation(format) };
        Assert.Equal(Matrix.Cells, ExpressionReader.CountCells(path, options));
        AssertSlice(Matrix, new CellRange(0, Matrix.Cells), ExpressionReader.Read(path, options));
        for (int part = 1; part <= 7; part++)
        {
            var range = CellRange.Part(part, 7, Matrix.Cells);
            AssertSlice(Matrix, range, ExpressionReader.Read(path, options with { Cells = range }));
        }
    }

    [Theory]
    [InlineData("h5ad-csr")]
    [InlineData("mtx")]
    [InlineData("csv-cells-as-rows")]
    [InlineData("csv-genes-as-rows")]
    public void ARangePastTheLastCell_IsRefusedNamingTheFileAndBothCounts(string format)
    {
        var path = Write(format);
        var e = Assert.Throws<ExpressionFormatException>(() => ExpressionReader.Read(path,
            new ExpressionReadOptions { KeepGene = SeededMatrix.Kept, Orientation = Orientation(format), Cells = new CellRange(590, 20) }));
        Assert.Contains("cells 590..609", e.Message);
        Assert.Contains($"holds {Matrix.Cells} cells", e.Message);
    }

    [Fact]
    public void Parts_CoverEveryCellOnce_AsTheBatchCommandSplitsItsItems()
    {
        // 10 cells in 3 parts by total*(i-1)/n .. total*i/n: 0-2, 3-5, 6-9 (worked by hand).
        Assert.Equal([new CellRange(0, 3), new CellRange(3, 3), new CellRange(6, 4)], Enumerable.Range(1, 3).Select(i => CellRange.Part(i, 3, 10)));
        foreach (var (total, parts) in new[] { (1, 1), (7, 7), (5, 8), (200_000, 100), (4_000_000, 1000) })
        {
            var ranges = Enumerable.Range(1, parts).Select(i => CellRange.Part(i, parts, total)).ToList();
            Assert.Equal(0, ranges[0].Start);
            Assert.Equal(total, ranges[^1].End);
            for (int i = 1; i < ranges.Count; i++) Assert.Equal(ranges[i - 1].End, ranges[i].Start);
        }
        Assert.Throws<ArgumentOutOfRangeException>(() => CellRange.Part(0, 3, 10));
        Assert.Throws<ArgumentOutOfRangeException>(() => CellRange.Part(4, 3, 10));
    }

    [Fact]
    public void CellsAsRows_StreamsPastOtherCellsWithoutParsingThem_AndStopsAfterTheRange()
    {
        var path = Write("csv-cells-as-rows");
        var options = new ExpressionReadOptions { KeepGene = SeededMatrix.Kept, Orientation = TableOrientation.CellsAsRows };
        var full = new ReadMeter();
        ExpressionReader.Read(path, options with { Meter = full });
        Assert.Equal((long)Matrix.Cells * Matrix.Genes, full.ValuesRead);
        var first = new ReadMeter();
        var range = CellRange.Part(1, 10, Matrix.Cells);
        ExpressionReader.Read(path, options with { Cells = range, Meter = first });
        Assert.Equal((long)range.Count * Matrix.Genes, first.ValuesRead);
        // The first tenth stops reading after its rows: far fewer bytes than the file (64 KB read-ahead buffers aside).
        Assert.True(first.BytesRead < new FileInfo(path).Length / 3, $"{first.BytesRead} of {new FileInfo(path).Length} bytes");
    }

    [Fact]
    public void CellsAsColumns_ParsesOnlyTheRangesColumns()
    {
        var path = Write("csv-genes-as-rows");
        var meter = new ReadMeter();
        var range = CellRange.Part(3, 10, Matrix.Cells);
        ExpressionReader.Read(path, new ExpressionReadOptions
        {
            KeepGene = SeededMatrix.Kept,
            Orientation = TableOrientation.GenesAsRows,
            Cells = range,
            Meter = meter,
        });
        Assert.Equal((long)range.Count * Matrix.Genes, meter.ValuesRead);
    }

    [Fact]
    public void MatrixMarket_ParsesOnlyTheEntriesOfTheRangesColumns()
    {
        var path = Write("mtx");
        var meter = new ReadMeter();
        var range = CellRange.Part(2, 5, Matrix.Cells);
        ExpressionReader.Read(path, new ExpressionReadOptions { KeepGene = SeededMatrix.Kept, Cells = range, Meter = meter });
        long inRange = Matrix.Values.SubMatrix(range.Start, range.Count, 0, Matrix.Genes)
            .EnumerateIndexed(MathNet.Numerics.LinearAlgebra.Zeros.AllowSkip).LongCount();
        Assert.Equal(inRange, meter.ValuesRead);
    }
}
