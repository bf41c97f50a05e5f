using System.Text.Json.Nodes;
using ExprModel.Data.Store;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Tests.Store;

public sealed class SnapshotArchiveTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-archive-" + Guid.NewGuid().ToString("N"));

    private string In(string name) => Path.Combine(_dir, name);

    private static NewSnapshot Sample(string notes, string? parent = null) => new()
    {
        ModelJson = """{"format":"exprmodel-model","name":"x,=HYPERLINK(\"http://a\")"}""",
        CatalogVersions = ["leak@1", "wb-na-1996@1"],
        Notes = notes,
        ParentId = parent,
    };

    private SnapshotStore Filled()
    {
        var store = SnapshotStore.Open(In("live.db"));
        var a = store.Save(Sample("first"));
        store.Save(Sample("edited", a.Id) with { Expression = [0, 255, 10], ExpressionName = "counts.csv", RecordedJson = "{}" });
        store.Save(Sample("another"));
        return store;
    }

    [Fact]
    public void An_export_imports_into_an_empty_store_field_for_field_and_a_second_import_adds_nothing()
    {
        var live = Filled();
        SnapshotArchive.Write(In("all.json"), live.All());
        var copy = SnapshotStore.Open(In("copy.db"));
        Assert.Equal((3, 0), copy.Import(SnapshotArchive.Read(In("all.json"))));
        Assert.Equal(live.All(), copy.All(), new SnapshotComparer());
        Assert.Equal((0, 3), copy.Import(SnapshotArchive.Read(In("all.json"))));
        Assert.True(copy.Verify().Sound);
    }

    [Fact]
    public void A_tampered_export_is_refused_naming_the_snapshot_and_nothing_is_imported()
    {
        var live = Filled();
        SnapshotArchive.Write(In("all.json"), live.All());
        var doc = JsonNode.Parse(File.ReadAllText(In("all.json")))!;
        var victim = doc["snapshots"]![1]!;
        victim["notes"] = "changed after export";
        File.WriteAllText(In("all.json"), doc.ToJsonString());
        var e = Assert.Throws<SnapshotException>(() => SnapshotArchive.Read(In("all.json")));
        Assert.Contains((string)victim["id"]!, e.Message);
        Assert.Contains("snapshots[1]", e.Message);
        Assert.Empty(SnapshotStore.Open(In("copy.db")).All());
    }

    [Fact]
    public void An_import_that_would_overwrite_a_different_snapshot_with_the_same_id_is_refused_whole()
    {
        var live = Filled();
        var all = live.All();
        var other = SnapshotStore.Open(In("other.db"));
        // Same id as the last snapshot, other content, its own valid checksum: an honest file from a foreign store.
        var clash = all[^1] with { Notes = "same id, other content" };
        clash = clash with { ContentSha256 = SnapshotContent.Sha256(clash) };
        other.Import([clash]);
        var e = Assert.Throws<SnapshotException>(() => other.Import(all));
        Assert.Contains(clash.Id, e.Message);
        Assert.Single(other.All());
        Assert.Equal("same id, other content", other.Find(clash.Id)!.Notes);
    }

    [Fact]
    public void An_online_backup_is_a_sound_copy_taken_while_the_store_stays_open()
    {
        var live = Filled();
        using (var reader = new SqliteConnection($"Data Source={live.DatabasePath};Pooling=False"))
        {
            reader.Open(); // another connection holds the file open, as the running app would
            live.Backup(In("backup.db"));
        }
        var backup = SnapshotStore.Open(In("backup.db"));
        Assert.Equal(live.All(), backup.All(), new SnapshotComparer());
        Assert.True(backup.Verify().Sound);
        Assert.Empty(Directory.GetFiles(_dir, "*.partial-*"));
    }

    [Theory]
    [InlineData("{}", "format")]
    [InlineData("""{"format":"exprmodel-snapshots","formatVersion":9,"snapshots":[]}""", "formatVersion")]
    [InlineData("""{"format":"exprmodel-snapshots","formatVersion":1,"snapshots":[{"id":"AAAAAAAAAAAAAAAAAAAAAA"}]}""", "snapshots[0]")]
    [InlineData("{\n\"format\": oops", "line 2")]
    public void A_malformed_export_is_refused_with_the_place_named(string text, string named)
    {
        Directory.CreateDirectory(_dir);
        File.WriteAllText(In("bad.json"), text);
        var e = Assert.Throws<SnapshotException>(() => SnapshotArchive.Read(In("bad.json")));
        Assert.Contains(In("bad.json"), e.Message);
        Assert.Contains(named, e.Message);
    }

    private sealed class SnapshotComparer : IEqualityComparer<Snapshot>
    {
        public bool Equals(Snapshot? a, Snapshot? b) => a is not null && b is not null && a.Id == b.Id && a.ParentId == b.ParentId
            && a.CreatedUtc == b.CreatedUtc && a.ModelJson == b.ModelJson && a.CatalogVersions.SequenceEqual(b.CatalogVersions)
            && a.ProtocolJson == b.ProtocolJson && a.ReadoutsJson == b.ReadoutsJson && a.Notes == b.Notes
            && (a.Expression ?? []).SequenceEqual(b.Expression ?? []) && (a.Expression is null) == (b.Expression is null)
            && a.ExpressionName == b.ExpressionName && a.RecordedJson == b.RecordedJson && a.ContentSha256 == b.ContentSha256;

        public int GetHashCode(Snapshot s) => s.Id.GetHashCode(StringComparison.Ordinal);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
