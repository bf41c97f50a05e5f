namespace ExprModel.Core.Expression.Metadata;

/// <summary>How to read a cell metadata table.</summary>
public sealed record CellMetadataOptions
{
    /// <summary>Header of the cell id column; null picks a column named like "cell", "cell_id", "barcode", "id" or else the first.</summary>
    public string? CellIdColumn { get; init; }
    /// <summary>Headers of the label columns; null takes every non-numeric column.</summary>
    public IReadOnlyList<string>? GroupColumns { get; init; }
    public int MaxRecordChars { get; init; } = 1 << 20;
    public int MaxColumns { get; init; } = 10_000;
    public long MaxDecompressedBytes { get; init; } = 4L << 30;
    /// <summary>The most physical lines the table may have, blank lines included.</summary>
    public long MaxLines { get; init; } = long.MaxValue;
    /// <summary>Stops reading when cancelled.</summary>
    public CancellationToken Cancel { get; init; }
}
