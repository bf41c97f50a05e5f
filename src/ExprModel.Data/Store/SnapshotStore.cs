using System.Globalization;
using System.Security.Cryptography;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Store;

/// <summary>
/// The web app's own SQLite database of shared snapshots. Created on first use; every write is one transaction;
/// rows are immutable (triggers refuse UPDATE, DELETE and an INSERT on an existing id, which closes INSERT OR REPLACE and
/// REPLACE INTO: SQLite runs no delete trigger for a REPLACE unless recursive triggers are on), so nothing already shared
/// can be altered or half-written. Every row carries a SHA-256 of its content, checked on every read.
/// Ids are 128 random bits from the operating system's CSPRNG, written base64url without padding (22 characters).
/// Errors of the database itself (rights, damage, checksum) are <see cref="SnapshotStoreException"/>s naming the file.
/// </summary>
public sealed class SnapshotStore
{
    /// <summary>
    /// 2 added <c>recorded_json</c>; 3 added <c>content_sha256</c> and the trigger refusing an INSERT on an existing id.
    /// Older databases are migrated on opening, in one transaction, keeping every snapshot.
    /// </summary>
    public const int SchemaVersion = 3;
    public const int IdBytes = 16;
    public const int MaxNotesLength = 20_000;

    private const string UpdateTrigger = """
        CREATE TRIGGER IF NOT EXISTS snapshots_immutable_update BEFORE UPDATE ON snapshots
            BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
        """;

    private const string Schema = """
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

    private const string Columns = "snapshot_id, parent_id, created_utc, model_json, catalog_versions, protocol_json, readouts_json, notes, expression, "
        + "expression_name, recorded_json, content_sha256";

    public string DatabasePath { get; }

    private SnapshotStore(string path) => DatabasePath = path;

    /// <summary>
    /// Opens the store at <paramref name="databasePath"/>, creating the file and its tables when missing, and checks it
    /// can serve: the file is an SQLite database, passes <c>PRAGMA quick_check</c>, is not marked read-only and takes a
    /// write (a row in <c>store_meta</c>). Anything else is refused with the path and the reason.
    /// </summary>
    public static SnapshotStore Open(string databasePath)
    {
        var full = Path.GetFullPath(databasePath);
        var store = new SnapshotStore(full);
        try
        {
            Directory.CreateDirectory(Path.GetDirectoryName(full)!);
            if (File.Exists(full) && !OperatingSystem.IsWindows() && (File.GetUnixFileMode(full) & UnixFileMode.UserWrite) == 0)
                throw new SnapshotStoreException(
                    $"{full}: the snapshot database is read-only (file mode without write permission); shares could not be saved.");
            using var conn = store.Connect();
            QuickCheck(conn, full);
            using var tx = conn.BeginTransaction();
            using (var cmd = conn.CreateCommand())
            {
                cmd.Transaction = tx;
                cmd.CommandText = Schema;
                cmd.ExecuteNonQuery();
                cmd.CommandText = "SELECT value FROM store_meta WHERE key = 'schema_version'";
                var found = cmd.ExecuteScalar() as string;
                if (found is null) SetMeta(cmd, "schema_version", SchemaVersion.ToString(CultureInfo.InvariantCulture));
                else if (found is "1" or "2") store.Migrate(cmd, found);
                else if (found != SchemaVersion.ToString(CultureInfo.InvariantCulture))
                    throw new SnapshotStoreException($"{full}: snapshot database schema {found} is not supported (this program uses {SchemaVersion}).");
                // A real write, so a file or folder that cannot take one is refused now rather than on the first share.
                SetMeta(cmd, "opened_utc", DateTimeOffset.UtcNow.ToString("O", CultureInfo.InvariantCulture));
            }
            tx.Commit();
        }
        catch (SqliteException e)
        {
            throw new SnapshotStoreException($"{full}: the snapshot database cannot be used: {Reason(e)}", e);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new SnapshotStoreException($"{full}: the snapshot database cannot be used: {e.Message}", e);
        }
        return store;
    }

    private static void SetMeta(SqliteCommand cmd, string key, string value)
    {
        cmd.Parameters.Clear();
        cmd.CommandText = "INSERT INTO store_meta (key, value) VALUES ($k, $v) ON CONFLICT(key) DO UPDATE SET value = excluded.value";
        cmd.Parameters.AddWithValue("$k", key);
        cmd.Parameters.AddWithValue("$v", value);
        cmd.ExecuteNonQuery();
        cmd.Parameters.Clear();
    }

    /// <summary>
    /// Brings a schema-1 or schema-2 database to the current schema inside the opening transaction. Adding nullable
    /// columns rewrites no row; the checksums of the snapshots already stored are computed from their content as read and
    /// written with the update trigger lifted for that one statement per row and restored before the commit, so a reader
    /// never sees a snapshot without its trigger or checksum.
    /// </summary>
    private void Migrate(SqliteCommand cmd, string from)
    {
        if (from == "1")
        {
            cmd.CommandText = "ALTER TABLE snapshots ADD COLUMN recorded_json TEXT";
            cmd.ExecuteNonQuery();
        }
        cmd.CommandText = "ALTER TABLE snapshots ADD COLUMN content_sha256 TEXT";
        cmd.ExecuteNonQuery();
        var rows = new List<Snapshot>();
        cmd.CommandText = $"SELECT {Columns} FROM snapshots";
        using (var r = cmd.ExecuteReader())
        {
            while (r.Read()) rows.Add(Read(r));
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
        SetMeta(cmd, "schema_version", SchemaVersion.ToString(CultureInfo.InvariantCulture));
    }

    private static void QuickCheck(SqliteConnection conn, string path)
    {
        using var cmd = conn.CreateCommand();
        cmd.CommandText = "PRAGMA quick_check";
        using var r = cmd.ExecuteReader();
        var problems = new List<string>();
        while (r.Read()) problems.Add(r.GetString(0));
        if (problems is not ["ok"])
            throw new SnapshotStoreException($"{path}: the snapshot database is damaged (quick_check: {string.Join("; ", problems.Take(3))}).");
    }

    /// <summary>SQLite's own words, e.g. "SQLite Error 26: 'file is not a database'."</summary>
    private static string Reason(SqliteException e) => e.Message;

    /// <summary>The default location: EXPRMODEL_APP_DB, else the user's local application data folder.</summary>
    public static string DefaultPath()
    {
        if (Environment.GetEnvironmentVariable("EXPRMODEL_APP_DB") is { Length: > 0 } env) return env;
        var baseDir = Environment.GetFolderPath(Environment.SpecialFolder.LocalApplicationData);
        if (string.IsNullOrEmpty(baseDir)) baseDir = Path.GetTempPath();
        return Path.Combine(baseDir, "exprmodel", "snapshots.db");
    }

    /// <summary>A fresh unguessable id: 128 bits from <see cref="RandomNumberGenerator"/>, base64url without padding.</summary>
    public static string NewId() => Base64Url(RandomNumberGenerator.GetBytes(IdBytes));

    /// <summary>True when <paramref name="id"/> has the shape of an id this store issues (22 base64url characters).</summary>
    public static bool IsWellFormedId(string? id) =>
        id is { Length: 22 } && id.All(c => c is >= 'A' and <= 'Z' or >= 'a' and <= 'z' or >= '0' and <= '9' or '-' or '_');

    /// <summary>Stores a new snapshot in one transaction and returns it as stored.</summary>
    public Snapshot Save(NewSnapshot s)
    {
        if (string.IsNullOrWhiteSpace(s.ModelJson)) throw new SnapshotException("model: the snapshot has no model.");
        if (s.Notes.Length > MaxNotesLength) throw new SnapshotException($"notes: at most {MaxNotesLength} characters (got {s.Notes.Length}).");
        if (s.ParentId is not null && !IsWellFormedId(s.ParentId)) throw new SnapshotException($"parentId: '{s.ParentId}' is not a snapshot id.");
        var snap = new Snapshot
        {
            Id = NewId(),
            ParentId = s.ParentId,
            CreatedUtc = DateTimeOffset.UtcNow,
            ModelJson = s.ModelJson,
            CatalogVersions = s.CatalogVersions.ToArray(),
            ProtocolJson = s.ProtocolJson,
            ReadoutsJson = s.ReadoutsJson,
            Notes = s.Notes,
            Expression = s.Expression,
            ExpressionName = s.Expression is null ? null : s.ExpressionName ?? "expression",
            RecordedJson = s.RecordedJson,
        };
        snap = snap with { ContentSha256 = SnapshotContent.Sha256(snap) };
        return Guarded(() =>
        {
            using var conn = Connect();
            using var tx = conn.BeginTransaction();
            using var cmd = conn.CreateCommand();
            cmd.Transaction = tx;
            if (snap.ParentId is not null && !Exists(cmd, snap.ParentId))
                throw new SnapshotException($"parentId: no snapshot '{snap.ParentId}' exists.");
            Insert(cmd, snap);
            tx.Commit();
            return snap;
        });
    }

    /// <summary>
    /// The snapshot with this id, or null when there is none (malformed ids are simply not found). A row whose content
    /// does not match its stored SHA-256 is refused with a <see cref="SnapshotStoreException"/> naming the id and the file.
    /// </summary>
    public Snapshot? Find(string id)
    {
        if (!IsWellFormedId(id)) return null;
        return Guarded(() =>
        {
            using var conn = Connect();
            using var cmd = conn.CreateCommand();
            cmd.CommandText = $"SELECT {Columns} FROM snapshots WHERE snapshot_id = $id";
            cmd.Parameters.AddWithValue("$id", id);
            using var r = cmd.ExecuteReader();
            return r.Read() ? Verified(Read(r)) : null;
        });
    }

    /// <summary>Ids of the snapshots made by editing <paramref name="id"/>.</summary>
    public IReadOnlyList<string> Children(string id) => Guarded(() =>
    {
        using var conn = Connect();
        using var cmd = conn.CreateCommand();
        cmd.CommandText = "SELECT snapshot_id FROM snapshots WHERE parent_id = $id ORDER BY created_utc";
        cmd.Parameters.AddWithValue("$id", id);
        using var r = cmd.ExecuteReader();
        var list = new List<string>();
        while (r.Read()) list.Add(r.GetString(0));
        return (IReadOnlyList<string>)list;
    });

    /// <summary>Every snapshot, oldest first, each verified against its checksum (the first mismatch is refused).</summary>
    public IReadOnlyList<Snapshot> All() => ReadAll().Select(Verified).ToArray();

    /// <summary>
    /// Checks the whole store: <c>PRAGMA integrity_check</c> on the file and every snapshot's content against its
    /// checksum. Returns what was checked and every problem found (none means the store is sound); never throws for a
    /// damaged row.
    /// </summary>
    public SnapshotVerification Verify() => Guarded(() =>
    {
        var problems = new List<string>();
        using (var conn = Connect())
        using (var cmd = conn.CreateCommand())
        {
            cmd.CommandText = "PRAGMA integrity_check";
            using var r = cmd.ExecuteReader();
            while (r.Read())
                if (r.GetString(0) != "ok") problems.Add($"{DatabasePath}: integrity_check: {r.GetString(0)}");
        }
        var rows = ReadAll();
        foreach (var row in rows)
            if (Mismatch(row) is { } why) problems.Add(why);
        return new SnapshotVerification(DatabasePath, rows.Count, problems);
    });

    /// <summary>
    /// Adds snapshots from an export in one transaction: each must match its checksum; one already stored with the same
    /// checksum is skipped, one stored under the same id with other content refuses the whole import (naming the id), as
    /// does a parent found neither in the store nor in the import. Nothing is written unless everything is accepted.
    /// </summary>
    /// <returns>How many were added and how many were already stored.</returns>
    public (int Added, int AlreadyStored) Import(IReadOnlyList<Snapshot> snapshots)
    {
        foreach (var s in snapshots)
        {
            if (!IsWellFormedId(s.Id)) throw new SnapshotException($"snapshot '{s.Id}': not a snapshot id.");
            if (SnapshotContent.Sha256(s) != s.ContentSha256)
                throw new SnapshotException($"snapshot {s.Id}: its content does not match its SHA-256 checksum; it was altered after export.");
        }
        return Guarded(() =>
        {
            using var conn = Connect();
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
                        throw new SnapshotException($"snapshot {s.Id}: a different snapshot with this id is already stored in {DatabasePath}.");
                    already++;
                    continue;
                }
                if (s.ParentId is not null && !Exists(cmd, s.ParentId))
                    throw new SnapshotException($"snapshot {s.Id}: its parent '{s.ParentId}' is neither stored nor in the import.");
                Insert(cmd, s);
                added++;
            }
            tx.Commit();
            return (added, already);
        });
    }

    /// <summary>
    /// Copies the live store to <paramref name="destination"/> with SQLite's online backup API while the app keeps
    /// serving; the copy is written beside the destination, checked with <c>PRAGMA quick_check</c> and then moved into
    /// place, so a failed backup never leaves a half-written file under the destination's name.
    /// </summary>
    public void Backup(string destination)
    {
        var full = Path.GetFullPath(destination);
        if (string.Equals(full, DatabasePath, StringComparison.Ordinal)) throw new SnapshotException($"{full}: the backup cannot replace the store itself.");
        var partial = full + ".partial-" + Guid.NewGuid().ToString("N");
        try
        {
            Guarded(() =>
            {
                using (var source = Connect())
                using (var target = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = partial, Pooling = false }.ToString()))
                {
                    target.Open();
                    source.BackupDatabase(target);
                    QuickCheck(target, partial);
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

    private static IEnumerable<Snapshot> ParentsFirst(IReadOnlyList<Snapshot> snapshots)
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

    private static bool Exists(SqliteCommand cmd, string id)
    {
        cmd.Parameters.Clear();
        cmd.CommandText = "SELECT COUNT(*) FROM snapshots WHERE snapshot_id = $p";
        cmd.Parameters.AddWithValue("$p", id);
        var found = Convert.ToInt64(cmd.ExecuteScalar(), CultureInfo.InvariantCulture) > 0;
        cmd.Parameters.Clear();
        return found;
    }

    private static void Insert(SqliteCommand cmd, Snapshot snap)
    {
        cmd.Parameters.Clear();
        cmd.CommandText = $"INSERT INTO snapshots ({Columns}) "
            + "VALUES ($id, $parent, $created, $model, $versions, $protocol, $readouts, $notes, $expr, $exprName, $recorded, $sha)";
        cmd.Parameters.AddWithValue("$id", snap.Id);
        cmd.Parameters.AddWithValue("$parent", (object?)snap.ParentId ?? DBNull.Value);
        cmd.Parameters.AddWithValue("$created", snap.CreatedUtc.ToString("O", CultureInfo.InvariantCulture));
        cmd.Parameters.AddWithValue("$model", snap.ModelJson);
        cmd.Parameters.AddWithValue("$versions", string.Join('\n', snap.CatalogVersions));
        cmd.Parameters.AddWithValue("$protocol", snap.ProtocolJson);
        cmd.Parameters.AddWithValue("$readouts", snap.ReadoutsJson);
        cmd.Parameters.AddWithValue("$notes", snap.Notes);
        cmd.Parameters.AddWithValue("$expr", (object?)snap.Expression ?? DBNull.Value);
        cmd.Parameters.AddWithValue("$exprName", (object?)snap.ExpressionName ?? DBNull.Value);
        cmd.Parameters.AddWithValue("$recorded", (object?)snap.RecordedJson ?? DBNull.Value);
        cmd.Parameters.AddWithValue("$sha", snap.ContentSha256);
        cmd.ExecuteNonQuery();
        cmd.Parameters.Clear();
    }

    private List<Snapshot> ReadAll() => Guarded(() =>
    {
        using var conn = Connect();
        using var cmd = conn.CreateCommand();
        cmd.CommandText = $"SELECT {Columns} FROM snapshots ORDER BY created_utc, snapshot_id";
        using var r = cmd.ExecuteReader();
        var list = new List<Snapshot>();
        while (r.Read()) list.Add(Read(r));
        return list;
    });

    private static Snapshot Read(SqliteDataReader r)
    {
        var versions = r.GetString(4);
        return new Snapshot
        {
            Id = r.GetString(0),
            ParentId = r.IsDBNull(1) ? null : r.GetString(1),
            CreatedUtc = DateTimeOffset.Parse(r.GetString(2), CultureInfo.InvariantCulture, DateTimeStyles.RoundtripKind),
            ModelJson = r.GetString(3),
            CatalogVersions = versions.Length == 0 ? [] : versions.Split('\n'),
            ProtocolJson = r.GetString(5),
            ReadoutsJson = r.GetString(6),
            Notes = r.GetString(7),
            Expression = r.IsDBNull(8) ? null : (byte[])r[8],
            ExpressionName = r.IsDBNull(9) ? null : r.GetString(9),
            RecordedJson = r.IsDBNull(10) ? null : r.GetString(10),
            ContentSha256 = r.FieldCount > 11 && !r.IsDBNull(11) ? r.GetString(11) : "",
        };
    }

    private string? Mismatch(Snapshot s)
    {
        if (s.ContentSha256.Length == 0) return $"snapshot {s.Id} in {DatabasePath}: it has no SHA-256 checksum.";
        var computed = SnapshotContent.Sha256(s);
        return computed == s.ContentSha256 ? null
            : $"snapshot {s.Id} in {DatabasePath}: its content does not match its SHA-256 checksum (stored {s.ContentSha256}, computed {computed}); "
              + "it was altered outside the app and is not served.";
    }

    private Snapshot Verified(Snapshot s) => Mismatch(s) is { } why ? throw new SnapshotStoreException(why) : s;

    /// <summary>Runs a database operation, naming this store's file in any SQLite or file-system error.</summary>
    private T Guarded<T>(Func<T> operation)
    {
        try
        {
            return operation();
        }
        catch (SqliteException e)
        {
            throw new SnapshotStoreException($"{DatabasePath}: {Reason(e)}", e);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new SnapshotStoreException($"{DatabasePath}: {e.Message}", e);
        }
    }

    private SqliteConnection Connect()
    {
        var conn = new SqliteConnection(new SqliteConnectionStringBuilder
        {
            DataSource = DatabasePath,
            Mode = SqliteOpenMode.ReadWriteCreate,
            Pooling = false,
            ForeignKeys = true,
            DefaultTimeout = 30,
        }.ToString());
        conn.Open();
        return conn;
    }

    private static string Base64Url(byte[] bytes) =>
        Convert.ToBase64String(bytes).TrimEnd('=').Replace('+', '-').Replace('/', '_');
}
