namespace ExprModel.Data.Store;

/// <summary>What a caller hands to <see cref="SnapshotStore.Save"/>; the store assigns id and time.</summary>
public sealed record NewSnapshot
{
    public string? ParentId { get; init; }
    public required string ModelJson { get; init; }
    public required IReadOnlyList<string> CatalogVersions { get; init; }
    public string ProtocolJson { get; init; } = "{}";
    public string ReadoutsJson { get; init; } = "[]";
    public string Notes { get; init; } = "";
    public byte[]? Expression { get; init; }
    public string? ExpressionName { get; init; }
    public string? RecordedJson { get; init; }
}
