namespace ExprModel.Data.Store;

/// <summary>Adding the snapshots of an export (<see cref="SnapshotArchive"/>) to a store.</summary>
public static class SnapshotImport
{
    /// <summary>
    /// Adds snapshots from an export in one transaction: each must match its checksum; one already stored with the same
    /// checksum is skipped, one stored under the same id with other content refuses the whole import (naming the id), as
    /// does a parent found neither in the store nor in the import. Nothing is written unless everything is accepted.
    /// </summary>
    /// <returns>How many were added and how many were already stored.</returns>
    public static (int Added, int AlreadyStored) Import(this SnapshotStore store, IReadOnlyList<Snapshot> snapshots)
    {
        foreach (var s in snapshots)
        {
            if (!SnapshotStore.IsWellFormedId(s.Id)) throw new SnapshotException($"snapshot '{s.Id}': not a snapshot id.");
            if (SnapshotContent.Sha256(s) != s.ContentSha256)
                throw new SnapshotException($"snapshot {s.Id}: its content does not match its SHA-256 checksum; it was altered after export.");
        }
        return store.Guarded(() =>
        {
            using var conn = store.Connect();
            using var tx = conn.BeginTransaction();
            using var cmd = conn.CreateCommand();
            cmd.Transaction = tx;
            int added = 0, already = 0;
            foreach (var s in ParentsFirst(snapshots))
            {
                cmd.Parameters.Clear();
                cmd.CommandText = "SELECT content_sha256 FROM snapshots WHERE snapshot_id = $id";
                cmd.Parameters.AddWithValue("$id", s.Id);
                var stored = cmd.ExecuteScalar();
                cmd.Parameters.Clear();
                if (stored is not null)
                {
                    if (stored as string != s.ContentSha256)
                        throw new SnapshotException($"snapshot {s.Id}: a different snapshot with this id is already stored in {store.DatabasePath}.");
                    already++;
                    continue;
                }
                if (s.ParentId is not null && !SnapshotRows.Exists(cmd, s.ParentId))
                    throw new SnapshotException($"snapshot {s.Id}: its parent '{s.ParentId}' is neither stored nor in the import.");
                SnapshotRows.Insert(cmd, s);
                added++;
            }
            tx.Commit();
            return (added, already);
        });
    }

    private static List<Snapshot> ParentsFirst(IReadOnlyList<Snapshot> snapshots)
    {
        var byId = snapshots.GroupBy(s => s.Id).ToDictionary(g => g.Key, g => g.First());
        var done = new HashSet<string>();
        var order = new List<Snapshot>();
        void Visit(Snapshot s, int depth)
        {
            if (depth > byId.Count || !done.Add(s.Id)) return;
            if (s.ParentId is not null && byId.TryGetValue(s.ParentId, out var p)) Visit(p, depth + 1);
            order.Add(s);
        }
        foreach (var s in snapshots.OrderBy(s => s.CreatedUtc)) Visit(s, 0);
        return order;
    }
}
