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
        Assert.Throws<SqliteException>(() => StoreFiles.Execute(DbPath, "UPDATE snapshots SET notes = 'changed'"));
        Assert.Throws<SqliteException>(() => StoreFiles.Execute(DbPath, "DELETE FROM snapshots"));
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
        StoreFiles.Execute(DbPath, """
                CREATE TABLE store_meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
                INSERT INTO store_meta VALUES ('schema_version', '1');
                CREATE TABLE snapshots (snapshot_id TEXT PRIMARY KEY, parent_id TEXT REFERENCES snapshots(snapshot_id), created_utc TEXT NOT NULL,
                    model_json TEXT NOT NULL, catalog_versions TEXT NOT NULL, protocol_json TEXT NOT NULL, readouts_json TEXT NOT NULL, notes TEXT NOT NULL,
                    expression BLOB, expression_name TEXT);
                CREATE TRIGGER snapshots_immutable_update BEFORE UPDATE ON snapshots BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
                CREATE TRIGGER snapshots_immutable_delete BEFORE DELETE ON snapshots BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
                INSERT INTO snapshots VALUES ('AAAAAAAAAAAAAAAAAAAAAA', NULL, '2026-01-02T03:04:05.0000000+00:00', '{}', 'leak@1', '{}',
                    '[]', 'old one', NULL, NULL);
                """);
        var store = SnapshotStore.Open(DbPath);
        var old = store.Find("AAAAAAAAAAAAAAAAAAAAAA")!;
        Assert.Equal(("old one", "[]", (string?)null), (old.Notes, old.ReadoutsJson, old.RecordedJson));
        var child = store.Save(Sample(parent: old.Id) with { RecordedJson = "{}" });
        Assert.Equal("{}", store.Find(child.Id)!.RecordedJson);
        SnapshotStore.Open(DbPath); // migrated once; opening again finds the current schema
        Assert.Throws<SqliteException>(() => StoreFiles.Execute(DbPath, "UPDATE snapshots SET recorded_json = 'x'"));
    }

    [Theory]
    [InlineData("INSERT OR REPLACE INTO snapshots (snapshot_id, created_utc, model_json, catalog_versions, protocol_json, readouts_json, notes) " +
        "VALUES ($id, '2026-01-01T00:00:00.0000000+00:00', '{\"forged\":1}', '', '{}', '[]', 'forged')")]
    [InlineData("REPLACE INTO snapshots (snapshot_id, created_utc, model_json, catalog_versions, protocol_json, readouts_json, notes) " +
        "VALUES ($id, '2026-01-01T00:00:00.0000000+00:00', '{\"forged\":1}', '', '{}', '[]', 'forged')")]
    [InlineData("INSERT INTO snapshots (snapshot_id, created_utc, model_json, catalog_versions, protocol_json, readouts_json, notes) " +
        "VALUES ($id, '2026-01-01T00:00:00.0000000+00:00', '{}', '', '{}', '[]', 'x') ON CONFLICT(snapshot_id) DO UPDATE SET notes = 'forged'")]
    public void Replacing_a_stored_snapshot_is_refused_by_the_schema(string sql)
    {
        var store = SnapshotStore.Open(DbPath);
        var saved = store.Save(Sample());
        var e = Assert.Throws<SqliteException>(() => StoreFiles.Execute(DbPath, sql, ("$id", saved.Id)));
        Assert.Contains("immutable", e.Message);
        var found = store.Find(saved.Id)!;
        Assert.Equal(("first try", saved.ModelJson), (found.Notes, found.ModelJson));
        Assert.Equal(1, CountRows());
    }

    [Fact]
    public void The_stored_checksum_is_the_sha256_of_the_content_and_a_tampered_row_is_refused_by_id_and_path()
    {
        var store = SnapshotStore.Open(DbPath);
        var saved = store.Save(Sample());
        var other = store.Save(Sample("untouched"));
        Assert.Matches("^[0-9a-f]{64}$", saved.ContentSha256);
        Assert.Equal(saved.ContentSha256, store.Find(saved.Id)!.ContentSha256);
        StoreFiles.ForgeNotes(DbPath, "snapshot_id = $id", ("$id", saved.Id));
        var e = Assert.Throws<SnapshotStoreException>(() => store.Find(saved.Id));
        Assert.Contains(saved.Id, e.Message);
        Assert.Contains(store.DatabasePath, e.Message);
        Assert.Contains("SHA-256", e.Message);
        Assert.Equal("untouched", store.Find(other.Id)!.Notes);
        var check = store.Verify();
        Assert.Equal(2, check.Checked);
        Assert.Single(check.Problems);
        Assert.Contains(saved.Id, check.Problems[0]);
    }

    [Fact]
    public void A_stored_checksum_equals_an_independent_sha256_of_the_documented_encoding()
    {
        // System.Security.Cryptography.SHA256 (FIPS 180-4) over the encoding the class documents, built here by hand.
        var store = SnapshotStore.Open(DbPath);
        var s = store.Find(store.Save(Sample() with { Expression = [7, 8], ExpressionName = "t.csv" }).Id)!;
        var bytes = new List<byte>();
        void Field(byte[]? v)
        {
            bytes.Add(v is null ? (byte)0 : (byte)1);
            var len = BitConverter.GetBytes((long)(v?.Length ?? 0));
            if (BitConverter.IsLittleEndian) Array.Reverse(len);
            bytes.AddRange(len);
            if (v is not null) bytes.AddRange(v);
        }
        byte[]? T(string? t) => t is null ? null : System.Text.Encoding.UTF8.GetBytes(t);
        Field(T(s.Id));
        Field(T(s.ParentId));
        Field(T(s.CreatedUtc.ToString("O", System.Globalization.CultureInfo.InvariantCulture)));
        Field(T(s.ModelJson));
        Field(T(string.Join('\n', s.CatalogVersions)));
        Field(T(s.ProtocolJson));
        Field(T(s.ReadoutsJson));
        Field(T(s.Notes));
        Field(s.Expression);
        Field(T(s.ExpressionName));
        Field(T(s.RecordedJson));
        Assert.Equal(Convert.ToHexStringLower(System.Security.Cryptography.SHA256.HashData(bytes.ToArray())), s.ContentSha256);
    }

    [Fact]
    public void A_schema_2_database_is_migrated_keeping_every_snapshot_with_a_checksum_and_refusing_replace()
    {
        StoreFiles.Execute(DbPath, """
                CREATE TABLE store_meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
                INSERT INTO store_meta VALUES ('schema_version', '2');
                CREATE TABLE snapshots (snapshot_id TEXT PRIMARY KEY, parent_id TEXT REFERENCES snapshots(snapshot_id), created_utc TEXT NOT NULL,
                    model_json TEXT NOT NULL, catalog_versions TEXT NOT NULL, protocol_json TEXT NOT NULL, readouts_json TEXT NOT NULL, notes TEXT NOT NULL,
                    expression BLOB, expression_name TEXT, recorded_json TEXT);
                CREATE INDEX snapshots_by_parent ON snapshots(parent_id);
                CREATE TRIGGER snapshots_immutable_update BEFORE UPDATE ON snapshots BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
                CREATE TRIGGER snapshots_immutable_delete BEFORE DELETE ON snapshots BEGIN SELECT RAISE(ABORT, 'snapshots are immutable'); END;
                INSERT INTO snapshots VALUES ('AAAAAAAAAAAAAAAAAAAAAA', NULL, '2026-01-02T03:04:05.0000000+00:00', '{"a":1}', 'leak@1', '{}',
                    '[]', 'old one', X'0102', 'counts.csv', '{"target":"cell 1"}');
                INSERT INTO snapshots VALUES ('BBBBBBBBBBBBBBBBBBBBBB', 'AAAAAAAAAAAAAAAAAAAAAA', '2026-01-03T03:04:05.0000000+00:00', '{"a":2}', '', '{}',
                    '[]', 'its child', NULL, NULL, NULL);
                """);
        var store = SnapshotStore.Open(DbPath);
        var all = store.All();
        Assert.Equal(["AAAAAAAAAAAAAAAAAAAAAA", "BBBBBBBBBBBBBBBBBBBBBB"], all.Select(s => s.Id));
        Assert.Equal(("old one", "{\"a\":1}", "{\"target\":\"cell 1\"}"), (all[0].Notes, all[0].ModelJson, all[0].RecordedJson));
        Assert.Equal(new byte[] { 1, 2 }, all[0].Expression);
        Assert.All(all, s => Assert.Equal(SnapshotContent.Sha256(s), s.ContentSha256));
        Assert.True(store.Verify().Sound);
        Assert.Equal("3", StoreFiles.Scalar(DbPath, "SELECT value FROM store_meta WHERE key = 'schema_version'"));
        Assert.Throws<SqliteException>(() => StoreFiles.Execute(DbPath, "UPDATE snapshots SET notes = 'x'"));
        Assert.Throws<SqliteException>(() => StoreFiles.Execute(DbPath,
            "REPLACE INTO snapshots (snapshot_id, created_utc, model_json, catalog_versions, protocol_json, readouts_json, notes) " +
            "VALUES ('AAAAAAAAAAAAAAAAAAAAAA', 'x', '{}', '', '{}', '[]', 'forged')"));
        Assert.Equal("old one", store.Find("AAAAAAAAAAAAAAAAAAAAAA")!.Notes);
    }

    [Fact]
    public void A_junk_file_is_refused_at_opening_with_its_path_and_reason()
    {
        Directory.CreateDirectory(Path.GetDirectoryName(DbPath)!);
        File.WriteAllText(DbPath, "this is not a database, just some text that happens to sit at the configured path\n");
        var e = Assert.Throws<SnapshotStoreException>(() => SnapshotStore.Open(DbPath));
        Assert.Contains(Path.GetFullPath(DbPath), e.Message);
        Assert.Contains("not a database", e.Message);
    }

    [Fact]
    public void A_database_with_damaged_pages_is_refused_at_opening()
    {
        var store = SnapshotStore.Open(DbPath);
        for (int i = 0; i < 40; i++) store.Save(Sample(new string('n', 2000)));
        StoreFiles.DamagePages(DbPath, "snapshots");
        var e = Assert.Throws<SnapshotStoreException>(() => SnapshotStore.Open(DbPath));
        Assert.Contains(Path.GetFullPath(DbPath), e.Message);
        Assert.True(e.Message.Contains("damaged") || e.Message.Contains("malformed"), e.Message);
    }

    [Fact]
    public void A_read_only_file_is_refused_at_opening()
    {
        if (OperatingSystem.IsWindows()) return; // file modes are a Unix notion; the app's image and CI run on Linux
        SnapshotStore.Open(DbPath).Save(Sample());
        File.SetUnixFileMode(DbPath, UnixFileMode.UserRead | UnixFileMode.GroupRead | UnixFileMode.OtherRead);
        var e = Assert.Throws<SnapshotStoreException>(() => SnapshotStore.Open(DbPath));
        Assert.Contains(Path.GetFullPath(DbPath), e.Message);
        Assert.Contains("read-only", e.Message);
        File.SetUnixFileMode(DbPath, UnixFileMode.UserRead | UnixFileMode.UserWrite);
    }

    [Fact]
    public void A_store_that_cannot_take_a_write_is_refused_at_opening_not_at_the_first_share()
    {
        // SQLite writes its rollback journal beside the file; a directory in that place makes every write fail, even
        // for a superuser, which is how this test makes the store unwritable whoever runs it.
        SnapshotStore.Open(DbPath).Save(Sample());
        Directory.CreateDirectory(DbPath + "-journal");
        var e = Assert.Throws<SnapshotStoreException>(() => SnapshotStore.Open(DbPath));
        Assert.Contains(Path.GetFullPath(DbPath), e.Message);
        Directory.Delete(DbPath + "-journal");
    }

    [Fact]
    public void Store_errors_after_opening_name_the_file()
    {
        var store = SnapshotStore.Open(DbPath);
        Directory.CreateDirectory(DbPath + "-journal");
        var e = Assert.Throws<SnapshotStoreException>(() => store.Save(Sample()));
        Assert.Contains(store.DatabasePath, e.Message);
        Directory.Delete(DbPath + "-journal");
    }

    private long CountRows() => (long)StoreFiles.Scalar(DbPath, "SELECT COUNT(*) FROM snapshots")!;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
