using ExprModel.Core.Expression;
using ExprModel.Core.Expression.AnnData;

namespace ExprModel.Core.Tests.Expression.AnnData;

/// <summary>
/// A shard of a CSR h5ad reads indptr for its rows and then only its rows' data and indices: counted in bytes taken
/// from the file and in bytes allocated, both far below a full read's (a read that loads the whole matrix cannot pass).
/// </summary>
public sealed class AnnDataMatrixReaderTests : IDisposable
{
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    // Larger than the format tests' matrix, so that a tenth of it spans several 4096-element chunks and the rest many more.
    private static readonly SeededMatrix Big = new(cells: 4000, genes: 2000, perCell: 60, seed: 3);

    private static (ReadMeter Meter, long Allocated) Measure(string path, CellRange? range)
    {
        var meter = new ReadMeter();
        var options = new ExpressionReadOptions { KeepGene = SeededMatrix.Kept, Cells = range, Meter = meter };
        long before = GC.GetAllocatedBytesForCurrentThread();
        var t = AnnDataReader.Read(path, options);
        long allocated = GC.GetAllocatedBytesForCurrentThread() - before;
        CellRangeTests.AssertSlice(Big, range ?? new CellRange(0, Big.Cells), t);
        return (meter, allocated);
    }

    [Fact]
    public void CsrShard_ReadsOnlyItsRowsChunks()
    {
        var path = Big.WriteH5ad(Path.Combine(_files.Dir, "big-csr.h5ad"), Big.SparseGroup(csr: true));
        var full = Measure(path, null);
        var range = CellRange.Part(5, 10, Big.Cells);
        var shard = Measure(path, range);
        long nnz = Big.Values.NonZerosCount;
        long shardNnz = ((MathNet.Numerics.LinearAlgebra.Double.SparseMatrix)Big.Values.SubMatrix(range.Start, range.Count, 0, Big.Genes)).NonZerosCount;
        // Elements fetched: the range's data and indices plus its row pointers and the last pointer.
        Assert.Equal(2 * shardNnz + range.Count + 2, shard.Meter.ValuesRead);
        Assert.Equal(2 * nnz + Big.Cells + 1, full.Meter.ValuesRead);
        // Bytes from the file and bytes allocated: a tenth of the rows must cost well under a third of the full read.
        Assert.True(shard.Meter.BytesRead * 3 < full.Meter.BytesRead, $"bytes read: shard {shard.Meter.BytesRead}, full {full.Meter.BytesRead}");
        Assert.True(shard.Allocated * 3 < full.Allocated, $"bytes allocated: shard {shard.Allocated}, full {full.Allocated}");
    }

    [Fact]
    public void CscShard_KeepsOnlyItsCells_ButReadsEveryEntry()
    {
        // Each gene column of a CSC matrix mixes every cell, so a shard streams all of it (memory flat, time not).
        var path = Big.WriteH5ad(Path.Combine(_files.Dir, "big-csc.h5ad"), Big.SparseGroup(csr: false));
        var shard = Measure(path, CellRange.Part(2, 10, Big.Cells));
        Assert.Equal(2 * Big.Values.NonZerosCount + Big.Genes + 1, shard.Meter.ValuesRead);
    }

    [Fact]
    public void DenseShard_ReadsARowHyperslab()
    {
        var small = CellRangeTests.Matrix;
        var path = small.WriteH5ad(Path.Combine(_files.Dir, "dense.h5ad"), small.Dense());
        var meter = new ReadMeter();
        var range = CellRange.Part(3, 6, small.Cells);
        var t = AnnDataReader.Read(path, new ExpressionReadOptions { KeepGene = SeededMatrix.Kept, Cells = range, Meter = meter });
        CellRangeTests.AssertSlice(small, range, t);
        Assert.Equal((long)range.Count * small.Genes, meter.ValuesRead);
    }

    [Fact]
    public void CountCells_ReadsTheObsIndexShapeOnly()
    {
        var path = Big.WriteH5ad(Path.Combine(_files.Dir, "count.h5ad"), Big.SparseGroup(csr: true));
        var meter = new ReadMeter();
        Assert.Equal(Big.Cells, ExpressionReader.CountCells(path, new ExpressionReadOptions { Meter = meter }));
        Assert.Equal(0, meter.ValuesRead);
        Assert.True(meter.BytesRead < new FileInfo(path).Length / 10, $"{meter.BytesRead} of {new FileInfo(path).Length} bytes");
    }
}
