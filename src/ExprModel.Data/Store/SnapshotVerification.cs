namespace ExprModel.Data.Store;

/// <summary>What <see cref="SnapshotStore.Verify"/> found: the file, how many snapshots it checked, and every problem.</summary>
public sealed record SnapshotVerification(string DatabasePath, int Checked, IReadOnlyList<string> Problems)
{
    public bool Sound => Problems.Count == 0;
}
