using ExprModel.Web.Workspace;

namespace ExprModel.Web.Apis;

public sealed record SaveModelRequest : ModelRequest
{
    public string? Notes { get; init; }
    /// <summary>The snapshot this one was made by editing.</summary>
    public string? ParentId { get; init; }
    public SnapshotProtocol? Protocol { get; init; }
    /// <summary>The raw expression table, stored only when given here (the user asked for it).</summary>
    [BulkText]
    public string? Expression { get; init; }
    public string? ExpressionName { get; init; }
}
