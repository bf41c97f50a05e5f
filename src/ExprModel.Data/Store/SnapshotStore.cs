using System.Globalization;
using System.Security.Cryptography;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Store;

/// <summary>
/// The web app's own SQLite database of shared snapshots. Created on first use; every write is one transaction;
/// rows are immutable (triggers refuse UPDATE and DELETE), so nothing already shared can be altered or half-written.
/// Ids are 128 random bits from the operating system's CSPRNG, written base64url without padding (22 characters).
/// </summary>
public sealed class SnapshotStore
{
    /// <summary>2 added <c>recorded_json</c>; a schema-1 database is migrated on opening (the column is added, old rows read it as null).</summary>
    public const int SchemaVersion = 2;
    public const int IdBytes = 16;
    public const int MaxNotesLength = 20_000;

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
            recorded_json TEXT);
        CREATE INDEX IF NOT EXISTS snapshots_by_parent ON snapshots(parent_id);
        CREATE TRIGGER IF NOT EXISTS snapshots_immutable_update BEFORE UPDATE ON snapshots
            BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
        CREATE TRIGGER IF NOT EXISTS snapshots_immutable_delete BEFORE DELETE ON snapshots
            BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
        """;

    public string DatabasePath { get; }

    private SnapshotStore(string path) => DatabasePath = path;

    /// <summary>Opens the store at <paramref name="databasePath"/>, creating the file and its tables when missing.</summary>
    public static SnapshotStore Open(string databasePath)
    {
        var full = Path.GetFullPath(databasePath);
        Directory.CreateDirectory(Path.GetDirectoryName(full)!);
        var store = new SnapshotStore(full);
        using var conn = store.Connect();
        using var tx = conn.BeginTransaction();
        using (var cmd = conn.CreateCommand())
        {
            cmd.Transaction = tx;
            cmd.CommandText = Schema;
            cmd.ExecuteNonQuery();
            cmd.CommandText = "SELECT value FROM store_meta WHERE key = 'schema_version'";
            var found = cmd.ExecuteScalar() as string;
            if (found is null)
            {
                cmd.CommandText = "INSERT INTO store_meta VALUES ('schema_version', $v)";
                cmd.Parameters.AddWithValue("$v", SchemaVersion.ToString(CultureInfo.InvariantCulture));
                cmd.ExecuteNonQuery();
            }
            else if (found == "1")
            {
                // Adding a nullable column rewrites no row (the immutability triggers guard UPDATE and DELETE, not ALTER), so
                // every snapshot already shared reads back as it was, with no recorded values; done in the opening transaction.
                cmd.CommandText = "ALTER TABLE snapshots ADD COLUMN recorded_json TEXT; UPDATE store_meta SET value = $v WHERE key = 'schema_version'";
                cmd.Parameters.AddWithValue("$v", SchemaVersion.ToString(CultureInfo.InvariantCulture));
                cmd.ExecuteNonQuery();
            }
            else if (found != SchemaVersion.ToString(CultureInfo.InvariantCulture))
            {
                throw new SnapshotException($"{full}: snapshot database schema {found} is not supported (this program uses {SchemaVersion}).");
            }
        }
        tx.Commit();
        return store;
    }

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
        using var conn = Connect();
        using var tx = conn.BeginTransaction();
        using var cmd = conn.CreateCommand();
        cmd.Transaction = tx;
        if (snap.ParentId is not null)
        {
            cmd.CommandText = "SELECT COUNT(*) FROM snapshots WHERE snapshot_id = $p";
            cmd.Parameters.AddWithValue("$p", snap.ParentId);
            if (Convert.ToInt64(cmd.ExecuteScalar(), CultureInfo.InvariantCulture) == 0)
                throw new SnapshotException($"parentId: no snapshot '{snap.ParentId}' exists.");
            cmd.Parameters.Clear();
        }
        cmd.CommandText = "INSERT INTO snapshots (snapshot_id, parent_id, created_utc, model_json, catalog_versions, protocol_json, readouts_json, notes, "
            + "expression, expression_name, recorded_json) "
            + "VALUES ($id, $parent, $created, $model, $versions, $protocol, $readouts, $notes, $expr, $exprName, $recorded)";
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
        cmd.ExecuteNonQuery();
        tx.Commit();
        return snap;
    }

    /// <summary>The snapshot with this id, or null when there is none (malformed ids are simply not found).</summary>
    public Snapshot? Find(string id)
    {
        if (!IsWellFormedId(id)) return null;
        using var conn = Connect();
        using var cmd = conn.CreateCommand();
        cmd.CommandText = "SELECT snapshot_id, parent_id, created_utc, model_json, catalog_versions, protocol_json, readouts_json, notes, expression, " +
            "expression_name, recorded_json FROM snapshots WHERE snapshot_id = $id";
        cmd.Parameters.AddWithValue("$id", id);
        using var r = cmd.ExecuteReader();
        if (!r.Read()) return null;
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
        };
    }

    /// <summary>Ids of the snapshots made by editing <paramref name="id"/>.</summary>
    public IReadOnlyList<string> Children(string id)
    {
        using var conn = Connect();
        using var cmd = conn.CreateCommand();
        cmd.CommandText = "SELECT snapshot_id FROM snapshots WHERE parent_id = $id ORDER BY created_utc";
        cmd.Parameters.AddWithValue("$id", id);
        using var r = cmd.ExecuteReader();
        var list = new List<string>();
        while (r.Read()) list.Add(r.GetString(0));
        return list;
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
