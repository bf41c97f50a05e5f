using System.Globalization;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Store;

/// <summary>
/// The tables and triggers of the snapshot database, its version and the migration of older versions. Rows are immutable:
/// triggers refuse UPDATE, DELETE and an INSERT on an existing id, which closes INSERT OR REPLACE and REPLACE INTO (SQLite
/// runs no delete trigger for a REPLACE unless recursive triggers are on).
/// </summary>
internal static class SnapshotSchema
{
    /// <summary>
    /// 2 added <c>recorded_json</c>; 3 added <c>content_sha256</c> and the trigger refusing an INSERT on an existing id.
    /// Older databases are migrated on opening, in one transaction, keeping every snapshot.
    /// </summary>
    public const int Version = 3;

    private const string UpdateTrigger = """
        CREATE TRIGGER IF NOT EXISTS snapshots_immutable_update BEFORE UPDATE ON snapshots
            BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
        """;

    private const string Tables = """
        CREATE TABLE IF NOT EXISTS store_meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
        CREATE TABLE IF NOT EXISTS snapshots (
            snapshot_id TEXT PRIMARY KEY,
            parent_id TEXT REFERENCES snapshots(snapshot_id),
            created_utc TEXT NOT NULL,
            model_json TEXT NOT NULL,
            catalog_versions TEXT NOT NULL,
            protocol_json TEXT NOT NULL,
            readouts_json TEXT NOT NULL,
            notes TEXT NOT NULL,
            expression BLOB,
            expression_name TEXT,
            recorded_json TEXT,
            content_sha256 TEXT);
        CREATE INDEX IF NOT EXISTS snapshots_by_parent ON snapshots(parent_id);
        CREATE TRIGGER IF NOT EXISTS snapshots_immutable_delete BEFORE DELETE ON snapshots
            BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
        CREATE TRIGGER IF NOT EXISTS snapshots_no_replace BEFORE INSERT ON snapshots
            WHEN EXISTS (SELECT 1 FROM snapshots WHERE snapshot_id = NEW.snapshot_id)
            BEGIN SELECT RAISE(ABORT, 'snapshots are immutable: this id is already stored'); END;
        """ + UpdateTrigger;

    /// <summary>
    /// Creates what is missing and brings an older database to <see cref="Version"/> inside <paramref name="cmd"/>'s
    /// transaction; a newer or unknown version is refused naming <paramref name="path"/>.
    /// </summary>
    public static void Apply(SqliteCommand cmd, string path)
    {
        cmd.CommandText = Tables;
        cmd.ExecuteNonQuery();
        cmd.CommandText = "SELECT value FROM store_meta WHERE key = 'schema_version'";
        var found = cmd.ExecuteScalar() as string;
        if (found is null) SetMeta(cmd, "schema_version", Version.ToString(CultureInfo.InvariantCulture));
        else if (found is "1" or "2") Migrate(cmd, found);
        else if (found != Version.ToString(CultureInfo.InvariantCulture))
            throw new SnapshotStoreException($"{path}: snapshot database schema {found} is not supported (this program uses {Version}).");
    }

    public static void SetMeta(SqliteCommand cmd, string key, string value)
    {
        cmd.Parameters.Clear();
        cmd.CommandText = "INSERT INTO store_meta (key, value) VALUES ($k, $v) ON CONFLICT(key) DO UPDATE SET value = excluded.value";
        cmd.Parameters.AddWithValue("$k", key);
        cmd.Parameters.AddWithValue("$v", value);
        cmd.ExecuteNonQuery();
        cmd.Parameters.Clear();
    }

    /// <summary>Refuses a file whose <c>PRAGMA quick_check</c> finds anything, naming <paramref name="path"/>.</summary>
    public static void QuickCheck(SqliteConnection conn, string path)
    {
        using var cmd = conn.CreateCommand();
        cmd.CommandText = "PRAGMA quick_check";
        using var r = cmd.ExecuteReader();
        var problems = new List<string>();
        while (r.Read()) problems.Add(r.GetString(0));
        if (problems is not ["ok"])
            throw new SnapshotStoreException($"{path}: the snapshot database is damaged (quick_check: {string.Join("; ", problems.Take(3))}).");
    }

    /// <summary>
    /// Brings a schema-1 or schema-2 database to the current schema inside the opening transaction. Adding nullable
    /// columns rewrites no row; the checksums of the snapshots already stored are computed from their content as read and
    /// written with the update trigger lifted for that one statement per row and restored before the commit, so a reader
    /// never sees a snapshot without its trigger or checksum.
    /// </summary>
    private static void Migrate(SqliteCommand cmd, string from)
    {
        if (from == "1")
        {
            cmd.CommandText = "ALTER TABLE snapshots ADD COLUMN recorded_json TEXT";
            cmd.ExecuteNonQuery();
        }
        cmd.CommandText = "ALTER TABLE snapshots ADD COLUMN content_sha256 TEXT";
        cmd.ExecuteNonQuery();
        var rows = new List<Snapshot>();
        cmd.CommandText = $"SELECT {SnapshotRows.Columns} FROM snapshots";
        using (var r = cmd.ExecuteReader())
        {
            while (r.Read()) rows.Add(SnapshotRows.Read(r));
        }
        cmd.CommandText = "DROP TRIGGER snapshots_immutable_update";
        cmd.ExecuteNonQuery();
        cmd.CommandText = "UPDATE snapshots SET content_sha256 = $h WHERE snapshot_id = $id";
        foreach (var row in rows)
        {
            cmd.Parameters.Clear();
            cmd.Parameters.AddWithValue("$h", SnapshotContent.Sha256(row));
            cmd.Parameters.AddWithValue("$id", row.Id);
            cmd.ExecuteNonQuery();
        }
        cmd.Parameters.Clear();
        cmd.CommandText = UpdateTrigger;
        cmd.ExecuteNonQuery();
        SetMeta(cmd, "schema_version", Version.ToString(CultureInfo.InvariantCulture));
    }
}
