using ExprModel.Core.Expression.AnnData;
using ExprModel.Core.Expression.Delimited;
using ExprModel.Core.Expression.MatrixMarket;
using ExprModel.Core.Expression.Text;

namespace ExprModel.Core.Expression;

/// <summary>
/// One entry point for every expression format: a directory is read as a Matrix Market matrix with sidecars; a file
/// is recognised by its content (HDF5 signature: AnnData .h5ad; "%%MatrixMarket" banner, gzip or not: Matrix
/// Market; anything else: delimited text), not by its name.
/// </summary>
public static class ExpressionReader
{
    public static ExpressionTable Read(string path, ExpressionReadOptions? options = null)
    {
        var o = options ?? ExpressionReadOptions.Default;
        if (Directory.Exists(path)) return SparseMatrixReader.Read(path, o);
        if (!File.Exists(path)) throw new ExpressionFormatException($"{Path.GetFileName(path)}: file not found ({path}).");
        if (InputFile.StartsWith(path, AnnDataReader.Signature)) return AnnDataReader.Read(path, o);
        if (StartsWithMatrixMarketBanner(path, o)) return SparseMatrixReader.Read(path, o);
        return DelimitedTableReader.Read(path, o);
    }

    /// <summary>
    /// How many cells the table at <paramref name="path"/> holds, read cheaply: the obs index's shape (h5ad), the cell
    /// sidecar's lines (Matrix Market), the header (delimited, cells as columns) or a pass over the rows that parses
    /// nothing (delimited, cells as rows). With it a shard can ask for its own <see cref="CellRange"/>.
    /// </summary>
    public static int CountCells(string path, ExpressionReadOptions? options = null)
    {
        var o = options ?? ExpressionReadOptions.Default;
        if (Directory.Exists(path)) return SparseMatrixReader.CountCells(path, o);
        if (!File.Exists(path)) throw new ExpressionFormatException($"{Path.GetFileName(path)}: file not found ({path}).");
        if (InputFile.StartsWith(path, AnnDataReader.Signature)) return AnnDataReader.CountCells(path, o);
        if (StartsWithMatrixMarketBanner(path, o)) return SparseMatrixReader.CountCells(path, o);
        return DelimitedTableReader.CountCells(path, o);
    }

    private static bool StartsWithMatrixMarketBanner(string path, ExpressionReadOptions o)
    {
        ReadOnlySpan<byte> banner = "%%MatrixMarket"u8;
        using var s = InputFile.Open(path, o.MaxDecompressedBytes);
        var head = new byte[banner.Length];
        try
        {
            int n = s.ReadAtLeast(head, head.Length, throwOnEndOfStream: false);
            return n == head.Length && head.AsSpan().SequenceEqual(banner);
        }
        catch (ExpressionFormatException) { return false; } // corrupt gzip: let the text reader report it with a location
    }
}
