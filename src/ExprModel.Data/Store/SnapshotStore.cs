using System.Globalization;
using System.Security.Cryptography;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Store;

/// <summary>
/// The web app's own SQLite database of shared snapshots. Created on first use; every write is one transaction;
/// rows are immutable (<see cref="SnapshotSchema"/>: triggers refuse UPDATE, DELETE and REPLACE), so nothing already
/// shared can be altered or half-written. Every row carries a SHA-256 of its content, checked on every read. Exports are
/// <see cref="SnapshotArchive"/>, imports <see cref="SnapshotImport"/>, online copies <see cref="SnapshotBackup"/>.
/// Ids are 128 random bits from the operating system's CSPRNG, written base64url without padding (22 characters).
/// Errors of the database itself (rights, damage, checksum) are <see cref="SnapshotStoreException"/>s naming the file.
/// </summary>
public sealed class SnapshotStore
{
    /// <summary>The database schema this program writes (<see cref="SnapshotSchema.Version"/>).</summary>
    public const int SchemaVersion = SnapshotSchema.Version;
    public const int IdBytes = 16;
    public const int MaxNotesLength = 20_000;

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
            SnapshotSchema.QuickCheck(conn, full);
            using var tx = conn.BeginTransaction();
            using (var cmd = conn.CreateCommand())
            {
                cmd.Transaction = tx;
                SnapshotSchema.Apply(cmd, full);
                // A real write, so a file or folder that cannot take one is refused now rather than on the first share.
                SnapshotSchema.SetMeta(cmd, "opened_utc", DateTimeOffset.UtcNow.ToString("O", CultureInfo.InvariantCulture));
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
            if (snap.ParentId is not null && !SnapshotRows.Exists(cmd, snap.ParentId))
                throw new SnapshotException($"parentId: no snapshot '{snap.ParentId}' exists.");
            SnapshotRows.Insert(cmd, snap);
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
            cmd.CommandText = $"SELECT {SnapshotRows.Columns} FROM snapshots WHERE snapshot_id = $id";
            cmd.Parameters.AddWithValue("$id", id);
            using var r = cmd.ExecuteReader();
            return r.Read() ? Verified(SnapshotRows.Read(r)) : null;
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

    private List<Snapshot> ReadAll() => Guarded(() =>
    {
        using var conn = Connect();
        using var cmd = conn.CreateCommand();
        cmd.CommandText = $"SELECT {SnapshotRows.Columns} FROM snapshots ORDER BY created_utc, snapshot_id";
        using var r = cmd.ExecuteReader();
        var list = new List<Snapshot>();
        while (r.Read()) list.Add(SnapshotRows.Read(r));
        return list;
    });

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
    internal T Guarded<T>(Func<T> operation)
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

    internal SqliteConnection Connect()
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
