namespace ExprModel.Web.Workspace;

/// <summary>
/// What was recorded from the cell or group a shared model was built for, stored with the snapshot (as it was when
/// shared; recorded data is not kept on the server otherwise).
/// </summary>
/// <param name="Target">"cell FH1001" or "group T1-fast".</param>
public sealed record SnapshotRecorded(string Target, IReadOnlyList<RecordedValue> Values)
{
    /// <summary>The recorded values of the workspace's open model's target, or null when it has none.</summary>
    public static SnapshotRecorded? Of(WorkspaceState workspace)
    {
        if (workspace.ModelTarget is not { } t || workspace.Recorded.ValuesFor(t) is not { Count: > 0 } values) return null;
        return new SnapshotRecorded(t.CellId is { } c ? "cell " + c : "group " + t.Group, values.Values.ToArray());
    }

    public IReadOnlyDictionary<string, RecordedValue> ByReadout => Values.ToDictionary(v => v.Readout, StringComparer.Ordinal);
}
