namespace ExprModel.Web.Apis;

/// <summary>
/// A compare request: the table and its options (<see cref="ExpressionRequest"/>), the recorded table (default: the
/// metadata) and how to compare.
/// </summary>
public sealed record CompareRequest : ExpressionRequest
{
    /// <summary>Per-cell recorded values with units in the headers, as CSV or TSV text; absent = the metadata table.</summary>
    [BulkText]
    public string? Recorded { get; init; }
    public string RecordedName { get; init; } = "recorded.csv";
    /// <summary>Cell id column of the recorded table; absent = a column named like a cell id.</summary>
    public string? RecordedCellColumn { get; init; }
    /// <summary>Column (header, or header without its unit) to read-out name, or to "none".</summary>
    public IReadOnlyDictionary<string, string>? Map { get; init; }
    /// <summary>cell (each recorded cell's own model) or group (its group's model).</summary>
    public string Per { get; init; } = "cell";
    /// <summary>Per-cell models: group (gamma-Poisson shrinkage towards the cell's group) or none.</summary>
    public string Shrink { get; init; } = "group";
}
