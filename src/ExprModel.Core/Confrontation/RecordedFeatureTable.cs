namespace ExprModel.Core.Confrontation;

/// <summary>
/// A per-cell table of recorded values as read, before any column is matched to a read-out: the cell id of every row,
/// the line each row starts on, and every other column's header and text, so a later error can name line and column.
/// </summary>
public sealed class RecordedFeatureTable
{
    /// <summary>The file name messages use.</summary>
    public required string Source { get; init; }
    public required string CellIdColumn { get; init; }
    /// <summary>1-based column number of the cell id column.</summary>
    public required int CellIdColumnNumber { get; init; }
    /// <summary>Every header, in file order (the cell id column included).</summary>
    public required IReadOnlyList<string> Headers { get; init; }
    public required IReadOnlyList<string> CellIds { get; init; }
    /// <summary>Line on which each row starts.</summary>
    public required IReadOnlyList<long> Lines { get; init; }
    /// <summary>Each row's fields, in header order.</summary>
    public required IReadOnlyList<string[]> Rows { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];
}
