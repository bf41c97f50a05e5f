namespace ExprModel.Data.Store;

/// <summary>
/// One shared model, frozen: the pinned model file (which carries its density rule and inputs), the catalog
/// versions it pins, the protocol and read-outs it was saved with, notes, and optionally the raw expression table.
/// A snapshot never changes; editing a shared model stores a new snapshot whose <see cref="ParentId"/> names the old one.
/// </summary>
public sealed record Snapshot
{
    public required string Id { get; init; }
    public string? ParentId { get; init; }
    public required DateTimeOffset CreatedUtc { get; init; }
    /// <summary>The model file (JSON), every channel pinned to a catalog version.</summary>
    public required string ModelJson { get; init; }
    /// <summary>"entry@version" for every catalog entry the model uses.</summary>
    public required IReadOnlyList<string> CatalogVersions { get; init; }
    /// <summary>The protocol the read-outs were taken with (JSON, the app's own shape).</summary>
    public string ProtocolJson { get; init; } = "{}";
    /// <summary>The read-outs as shown when the snapshot was saved (JSON), so a reader can confirm a re-run matches.</summary>
    public string ReadoutsJson { get; init; } = "[]";
    public string Notes { get; init; } = "";
    /// <summary>The raw expression table, stored only when the user asked for it.</summary>
    public byte[]? Expression { get; init; }
    public string? ExpressionName { get; init; }
    /// <summary>What was recorded from the cell or group the model was built for (JSON, the app's own shape); null when
    /// nothing was, and in snapshots made before schema 2.</summary>
    public string? RecordedJson { get; init; }
    /// <summary>SHA-256 of the content (<see cref="SnapshotContent.Sha256"/>), as stored and verified on reading; empty until stored.</summary>
    public string ContentSha256 { get; init; } = "";
}
