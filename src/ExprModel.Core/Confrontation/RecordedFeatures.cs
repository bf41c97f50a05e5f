namespace ExprModel.Core.Confrontation;

/// <summary>A recorded table matched to read-outs: every column's match (or why not), and the matched values per cell.</summary>
public sealed class RecordedFeatures
{
    public required string Source { get; init; }
    /// <summary>One entry per column other than the cell id column, in file order.</summary>
    public required IReadOnlyList<ReadoutMatch> Matches { get; init; }
    public required IReadOnlyList<RecordedReadout> Readouts { get; init; }
    /// <summary>Cells with at least one recorded value in a matched column, in file order.</summary>
    public required IReadOnlyList<string> RecordedCells { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];
}
