using ExprModel.Data.Store;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Tests.Store;

public sealed class SnapshotStoreTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-store-" + Guid.NewGuid().ToString("N"));
    private string DbPath => Path.Combine(_dir, "nested", "snapshots.db");

    private static NewSnapshot Sample(string notes = "first try", string? parent = null) => new()
    {
        ModelJson = """{"format":"exprmodel-model"}""",
        CatalogVersions = ["leak@1", "wb-na-1996@1"],
        ProtocolJson = """{"step":{"amplitudeUaPerCm2":2}}""",
        ReadoutsJson = """[{"name":"rheobase","unit":"uA/cm2","value":0.16}]""",
        Notes = notes,
        ParentId = parent,
    };

    [Fact]
    public void Open_creates_the_database_and_its_folder_on_first_use()
    {
        Assert.False(File.Exists(DbPath));
        SnapshotStore.Open(DbPath);
        Assert.True(File.Exists(DbPath));
        SnapshotStore.Open(DbPath); // opening again keeps the same schema
    }

    [Fact]
    public void A_saved_snapshot_reads_back_field_for_field()
    {
        var store = SnapshotStore.Open(DbPath);
        var saved = store.Save(Sample() with { Expression = [1, 2, 3], ExpressionName = "counts.csv" });
        var found = store.Find(saved.Id)!;
        Assert.Equal(saved.ModelJson, found.ModelJson);
        Assert.Equal(saved.CatalogVersions, found.CatalogVersions);
        Assert.Equal(saved.ProtocolJson, found.ProtocolJson);
        Assert.Equal(saved.ReadoutsJson, found.ReadoutsJson);
        Assert.Equal("first try", found.Notes);
        Assert.Equal(new byte[] { 1, 2, 3 }, found.Expression);
        Assert.Equal("counts.csv", found.ExpressionName);
        Assert.Equal(saved.CreatedUtc, found.CreatedUtc);
        Assert.Null(found.ParentId);
    }

    [Fact]
    public void Ids_are_128_bit_base64url_and_distinct()
    {
        var store = SnapshotStore.Open(DbPath);
        var ids = Enumerable.Range(0, 50).Select(_ => store.Save(Sample()).Id).ToList();
        Assert.Equal(50, ids.Distinct().Count());
        foreach (var id in ids)
        {
            Assert.Matches("^[A-Za-z0-9_-]{22}$", id);
            var bytes = Convert.FromBase64String(id.Replace('-', '+').Replace('_', '/') + "==");
            Assert.Equal(16, bytes.Length);
        }
    }

    [Fact]
    public void The_raw_expression_is_absent_unless_given()
    {
        var store = SnapshotStore.Open(DbPath);
        var found = store.Find(store.Save(Sample()).Id)!;
        Assert.Null(found.Expression);
        Assert.Null(found.ExpressionName);
    }

    [Fact]
    public void An_edit_records_its_parent_and_the_parent_lists_it()
    {
        var store = SnapshotStore.Open(DbPath);
        var parent = store.Save(Sample());
        var child = store.Save(Sample("edited", parent.Id));
        Assert.Equal(parent.Id, store.Find(child.Id)!.ParentId);
        Assert.Equal([child.Id], store.Children(parent.Id));
    }

    [Fact]
    public void An_unknown_parent_is_refused_and_nothing_is_written()
    {
        var store = SnapshotStore.Open(DbPath);
        var e = Assert.Throws<SnapshotException>(() => store.Save(Sample(parent: "AAAAAAAAAAAAAAAAAAAAAA")));
        Assert.Contains("parentId", e.Message);
        Assert.Equal(0, CountRows());
    }

    [Fact]
    public void Oversize_notes_are_refused_with_the_field_named()
    {
        var store = SnapshotStore.Open(DbPath);
        var e = Assert.Throws<SnapshotException>(() => store.Save(Sample(new string('x', SnapshotStore.MaxNotesLength + 1))));
        Assert.Contains("notes", e.Message);
        Assert.Equal(0, CountRows());
    }

    [Fact]
    public void Stored_snapshots_cannot_be_changed_or_deleted()
    {
        var store = SnapshotStore.Open(DbPath);
        var saved = store.Save(Sample());
        using var conn = new SqliteConnection($"Data Source={DbPath};Pooling=False");
        conn.Open();
        using var cmd = conn.CreateCommand();
        cmd.CommandText = "UPDATE snapshots SET notes = 'changed'";
        Assert.Throws<SqliteException>(() => cmd.ExecuteNonQuery());
        cmd.CommandText = "DELETE FROM snapshots";
        Assert.Throws<SqliteException>(() => cmd.ExecuteNonQuery());
        Assert.Equal("first try", store.Find(saved.Id)!.Notes);
    }

    [Theory]
    [InlineData("")]
    [InlineData("short")]
    [InlineData("AAAAAAAAAAAAAAAAAAAAA!")]
    [InlineData("../../etc/passwd......")]
    public void Malformed_or_unknown_ids_are_not_found(string id)
    {
        var store = SnapshotStore.Open(DbPath);
        store.Save(Sample());
        Assert.Null(store.Find(id));
    }

    [Fact]
    public void Recorded_values_are_stored_with_the_snapshot_and_absent_unless_given()
    {
        var store = SnapshotStore.Open(DbPath);
        var with = store.Save(Sample() with { RecordedJson = """{"target":"cell FH1001"}""" });
        Assert.Equal("""{"target":"cell FH1001"}""", store.Find(with.Id)!.RecordedJson);
        Assert.Null(store.Find(store.Save(Sample()).Id)!.RecordedJson);
    }

    [Fact]
    public void A_schema_1_database_opens_with_its_snapshots_unchanged_and_stays_immutable()
    {
        // The schema-1 table as it was shipped, with one row written the way that version wrote it.
        Directory.CreateDirectory(Path.GetDirectoryName(DbPath)!);
        using (var conn = new SqliteConnection($"Data Source={DbPath};Pooling=False"))
        {
            conn.Open();
            using var cmd = conn.CreateCommand();
            cmd.CommandText = """
                CREATE TABLE store_meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
                INSERT INTO store_meta VALUES ('schema_version', '1');
                CREATE TABLE snapshots (snapshot_id TEXT PRIMARY KEY, parent_id TEXT REFERENCES snapshots(snapshot_id), created_utc TEXT NOT NULL,
                    model_json TEXT NOT NULL, catalog_versions TEXT NOT NULL, protocol_json TEXT NOT NULL, readouts_json TEXT NOT NULL, notes TEXT NOT NULL,
                    expression BLOB, expression_name TEXT);
                CREATE TRIGGER snapshots_immutable_update BEFORE UPDATE ON snapshots BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
                CREATE TRIGGER snapshots_immutable_delete BEFORE DELETE ON snapshots BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
                INSERT INTO snapshots VALUES ('AAAAAAAAAAAAAAAAAAAAAA', NULL, '2026-01-02T03:04:05.0000000+00:00', '{}', 'leak@1', '{}',
                    '[]', 'old one', NULL, NULL);
                """;
            cmd.ExecuteNonQuery();
        }
        var store = SnapshotStore.Open(DbPath);
        var old = store.Find("AAAAAAAAAAAAAAAAAAAAAA")!;
        Assert.Equal(("old one", "[]", (string?)null), (old.Notes, old.ReadoutsJson, old.RecordedJson));
        var child = store.Save(Sample(parent: old.Id) with { RecordedJson = "{}" });
        Assert.Equal("{}", store.Find(child.Id)!.RecordedJson);
        SnapshotStore.Open(DbPath); // migrated once; opening again finds schema 2
        using var check = new SqliteConnection($"Data Source={DbPath};Pooling=False");
        check.Open();
        using var update = check.CreateCommand();
        update.CommandText = "UPDATE snapshots SET recorded_json = 'x'";
        Assert.Throws<SqliteException>(() => update.ExecuteNonQuery());
    }

    private long CountRows()
    {
        using var conn = new SqliteConnection($"Data Source={DbPath};Pooling=False");
        conn.Open();
        using var cmd = conn.CreateCommand();
        cmd.CommandText = "SELECT COUNT(*) FROM snapshots";
        return (long)cmd.ExecuteScalar()!;
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
