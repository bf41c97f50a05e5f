using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Store;

/// <summary>An online copy of a running store through SQLite's backup API.</summary>
public static class SnapshotBackup
{
    /// <summary>
    /// Copies the live store to <paramref name="destination"/> with SQLite's online backup API while the app keeps
    /// serving; the copy is written beside the destination, checked with <c>PRAGMA quick_check</c> and then moved into
    /// place, so a failed backup never leaves a half-written file under the destination's name.
    /// </summary>
    public static void Backup(this SnapshotStore store, string destination)
    {
        var full = Path.GetFullPath(destination);
        if (string.Equals(full, store.DatabasePath, StringComparison.Ordinal))
            throw new SnapshotException($"{full}: the backup cannot replace the store itself.");
        var partial = full + ".partial-" + Guid.NewGuid().ToString("N");
        try
        {
            store.Guarded(() =>
            {
                using (var source = store.Connect())
                using (var target = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = partial, Pooling = false }.ToString()))
                {
                    target.Open();
                    source.BackupDatabase(target);
                    SnapshotSchema.QuickCheck(target, partial);
                }
                return 0;
            });
            File.Move(partial, full, overwrite: true);
        }
        finally
        {
            if (File.Exists(partial)) File.Delete(partial);
        }
    }
}
