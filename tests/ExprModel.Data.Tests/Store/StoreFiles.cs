using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Tests.Store;

/// <summary>Damages SQLite files the way a failing disk would, for the start-up fault tests.</summary>
public static class StoreFiles
{
    /// <summary>Overwrites the root page of <paramref name="table"/> with junk, leaving the header and other tables intact.</summary>
    public static void DamagePages(string path, string table)
    {
        long pageSize, root;
        using (var conn = new SqliteConnection($"Data Source={path};Pooling=False"))
        {
            conn.Open();
            using var cmd = conn.CreateCommand();
            cmd.CommandText = "PRAGMA page_size";
            pageSize = (long)cmd.ExecuteScalar()!;
            cmd.CommandText = "SELECT rootpage FROM sqlite_master WHERE name = $t";
            cmd.Parameters.AddWithValue("$t", table);
            root = (long)cmd.ExecuteScalar()!;
        }
        using var f = new FileStream(path, FileMode.Open, FileAccess.Write);
        f.Position = (root - 1) * pageSize;
        var junk = new byte[pageSize];
        new Random(7).NextBytes(junk);
        f.Write(junk);
    }
}
