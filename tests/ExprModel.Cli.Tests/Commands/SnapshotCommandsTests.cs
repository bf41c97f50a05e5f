using System.Text.Json.Nodes;
using ExprModel.Data.Store;
using ExprModel.Data.Tests.Store;

namespace ExprModel.Cli.Tests.Commands;

public sealed class SnapshotCommandsTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("exprmodel-snapshot-cli-").FullName;

    private string In(string name) => Path.Combine(_dir, name);

    private SnapshotStore Live()
    {
        var store = SnapshotStore.Open(In("live.db"));
        var a = store.Save(new NewSnapshot { ModelJson = "{\"name\":\"a\"}", CatalogVersions = ["leak@1"], Notes = "first" });
        store.Save(new NewSnapshot { ModelJson = "{\"name\":\"b\"}", CatalogVersions = ["leak@1"], ParentId = a.Id, Expression = [1, 2] });
        return store;
    }

    [Fact]
    public void Export_then_import_into_a_new_store_then_verify_keeps_every_snapshot()
    {
        var live = Live();
        var e = CliRunner.Run("snapshots", "export", In("all.json"), "--store", live.DatabasePath);
        Assert.True(e.Exit == 0, e.Err);
        var i = CliRunner.Run("snapshots", "import", In("all.json"), "--store", In("copy.db"));
        Assert.True(i.Exit == 0, i.Err);
        Assert.Contains("imported 2 snapshots", i.Out);
        var v = CliRunner.Run("snapshots", "verify", "--store", In("copy.db"));
        Assert.Equal(0, v.Exit);
        Assert.Contains("2 snapshots checked, 0 problems", v.Out);
        Assert.Equal(live.All().Select(s => s.ContentSha256), SnapshotStore.Open(In("copy.db")).All().Select(s => s.ContentSha256));
    }

    [Fact]
    public void A_tampered_export_is_refused_naming_the_id_and_the_store_is_left_untouched()
    {
        var live = Live();
        Assert.Equal(0, CliRunner.Run("snapshots", "export", In("all.json"), "--store", live.DatabasePath).Exit);
        var doc = JsonNode.Parse(File.ReadAllText(In("all.json")))!;
        doc["snapshots"]![0]!["model"] = "{\"name\":\"forged\"}";
        File.WriteAllText(In("all.json"), doc.ToJsonString());
        var (exit, _, err) = CliRunner.Run("snapshots", "import", In("all.json"), "--store", In("copy.db"));
        Assert.Equal(1, exit);
        Assert.Contains((string)doc["snapshots"]![0]!["id"]!, err);
        Assert.False(File.Exists(In("copy.db")));
    }

    [Fact]
    public void Backup_writes_a_sound_copy_and_verify_reports_a_tampered_row()
    {
        var live = Live();
        var b = CliRunner.Run("snapshots", "backup", In("backup.db"), "--store", live.DatabasePath);
        Assert.True(b.Exit == 0, b.Err);
        Assert.Equal(2, SnapshotStore.Open(In("backup.db")).All().Count);
        StoreFiles.ForgeNotes(In("backup.db"), "notes = 'first'");
        var v = CliRunner.Run("snapshots", "verify", "--store", In("backup.db"));
        Assert.Equal(1, v.Exit);
        Assert.Contains("1 problems", v.Out);
        Assert.Contains("SHA-256", v.Err);
    }

    [Fact]
    public void A_junk_store_is_refused_with_its_path()
    {
        File.WriteAllText(In("junk.db"), "junk junk junk junk junk junk junk junk junk junk junk junk junk junk\n");
        var (exit, _, err) = CliRunner.Run("snapshots", "verify", "--store", In("junk.db"));
        Assert.Equal(1, exit);
        Assert.Contains(In("junk.db"), err);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
