using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Tests.Store;

/// <summary>
/// What other programs do to a snapshot database behind the store's back, for the store, CLI and start-up fault tests:
/// raw SQL as any SQLite client would run it, a hostile edit of a stored row, and damage as a failing disk would leave it.
/// </summary>
public static class StoreFiles
{
    /// <summary>Runs <paramref name="sql"/> on the file directly (creating the file and its folder if missing), with $-named parameters.</summary>
    public static void Execute(string path, string sql, params (string Name, object Value)[] parameters)
    {
        using var cmd = Command(path, sql, parameters, out var conn);
        using (conn) cmd.ExecuteNonQuery();
    }

    /// <summary>The first column of the first row of <paramref name="sql"/>, read directly from the file.</summary>
    public static object? Scalar(string path, string sql)
    {
        using var cmd = Command(path, sql, [], out var conn);
        using (conn) return cmd.ExecuteScalar();
    }

    /// <summary>
    /// Changes the notes of the rows matching <paramref name="where"/> as a hostile writer would: lifts the update trigger,
    /// updates, and puts the trigger back, so only the content checksum can tell.
    /// </summary>
    public static void ForgeNotes(string path, string where, params (string Name, object Value)[] parameters) =>
        Execute(path, $"""
            DROP TRIGGER snapshots_immutable_update;
            UPDATE snapshots SET notes = 'forged' WHERE {where};
            CREATE TRIGGER snapshots_immutable_update BEFORE UPDATE ON snapshots BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
            """, parameters);

    private static SqliteCommand Command(string path, string sql, (string Name, object Value)[] parameters, out SqliteConnection conn)
    {
        Directory.CreateDirectory(Path.GetDirectoryName(Path.GetFullPath(path))!);
        conn = new SqliteConnection($"Data Source={path};Pooling=False");
        conn.Open();
        var cmd = conn.CreateCommand();
        cmd.CommandText = sql;
        foreach (var (name, value) in parameters) cmd.Parameters.AddWithValue(name, value);
        return cmd;
    }

    /// <summary>Overwrites the root page of <paramref name="table"/> with junk, leaving the header and other tables intact.</summary>
    public static void DamagePages(string path, string table)
    {
        long root, pageSize = (long)Scalar(path, "PRAGMA page_size")!;
        using (var cmd = Command(path, "SELECT rootpage FROM sqlite_master WHERE name = $t", [("$t", table)], out var conn))
        using (conn) root = (long)cmd.ExecuteScalar()!;
        using var f = new FileStream(path, FileMode.Open, FileAccess.Write);
        f.Position = (root - 1) * pageSize;
        var junk = new byte[pageSize];
        new Random(7).NextBytes(junk);
        f.Write(junk);
    }
}
