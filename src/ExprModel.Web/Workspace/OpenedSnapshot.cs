using ExprModel.Core.Models;
using ExprModel.Data.Store;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>A stored snapshot opened again: its model, and its read-outs as saved and as re-run now.</summary>
public sealed record OpenedSnapshot(Snapshot Stored, ModelDocument Model, SnapshotProtocol Protocol,
    IReadOnlyList<ReadoutRow> SavedReadouts, IReadOnlyList<ReadoutRow> RerunReadouts)
{
    /// <summary>The recorded values stored with the snapshot (null when the model's cell or group had none, or it predates them).</summary>
    public SnapshotRecorded? Recorded { get; init; }

    /// <summary>True when the re-run reproduces every saved read-out exactly (same bits).</summary>
    public bool Reproduced => ReadoutComparison.Identical(SavedReadouts, RerunReadouts);
}
