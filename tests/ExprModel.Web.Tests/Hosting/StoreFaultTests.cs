using System.Net;
using System.Net.Http.Json;
using System.Text.Json;
using ExprModel.Data.Store;
using Microsoft.Data.Sqlite;

namespace ExprModel.Web.Tests.Hosting;

/// <summary>
/// Fault tests against the real app in a child process: a bad snapshot database refuses the start-up naming the file,
/// a damaged catalog cache is rebuilt, and shares acknowledged before a kill -9 are all there after the restart.
/// </summary>
public sealed class StoreFaultTests : IDisposable
{
    private static readonly TimeSpan StartLimit = TimeSpan.FromSeconds(90);
    private readonly string _dir = Directory.CreateTempSubdirectory("exprmodel-faults-").FullName;

    private string In(string name) => Path.Combine(_dir, name);

    private static object Share(int n) => new
    {
        model = JsonDocument.Parse("""
            {"format":"exprmodel-model","schemaVersion":1,"name":"passive","cell":{"areaUm2":1000},
             "channels":[{"entry":"leak","densityMsPerCm2":0.1}]}
            """).RootElement,
        notes = $"share {n}",
    };

    public static TheoryData<string, string> BadStores() => new()
    {
        { "junk", "not a database" },
        { "damaged", "" },
        { "read-only", "read-only" },
        { "unwritable", "" },
    };

    [Theory]
    [MemberData(nameof(BadStores))]
    public async Task A_bad_snapshot_database_refuses_the_start_up_with_its_path(string fault, string reason)
    {
        if (OperatingSystem.IsWindows()) return; // file modes and kill -9 are Unix notions; the app's image and CI run on Linux
        var db = In("snapshots.db");
        var store = SnapshotStore.Open(db);
        for (int i = 0; i < 40; i++) store.Save(new NewSnapshot { ModelJson = "{}", CatalogVersions = [], Notes = new string('n', 2000) });
        switch (fault)
        {
            case "junk": File.WriteAllText(db, "a text file where the snapshot database should be, long enough to fill a header\n"); break;
            case "damaged": ExprModel.Data.Tests.Store.StoreFiles.DamagePages(db, "snapshots"); break;
            case "read-only": File.SetUnixFileMode(db, UnixFileMode.UserRead); break;
            case "unwritable": Directory.CreateDirectory(db + "-journal"); break;
        }
        using var app = AppProcess.Start(db, In("catalog.db"));
        Assert.True(app.WaitForExit(StartLimit), "the app did not stop: " + app.Output);
        Assert.Equal(1, app.ExitCode);
        Assert.Contains("ExprModel cannot start", app.Output);
        Assert.Contains(db, app.Output);
        Assert.Contains(reason, app.Output);
        Assert.DoesNotContain("   at ", app.Output); // a message, not a stack trace
        await Task.CompletedTask;
    }

    [Fact]
    public async Task A_catalog_database_with_damaged_pages_is_rebuilt_at_start_up()
    {
        ExprModel.Data.Catalog.CatalogLocator.Ensure(In("catalog.db"));
        ExprModel.Data.Tests.Store.StoreFiles.DamagePages(In("catalog.db"), "gate_rates");
        using var app = AppProcess.Start(In("snapshots.db"), In("catalog.db"));
        Assert.True(await app.ReadyAsync(StartLimit), app.Output);
        var post = await app.Client.PostAsJsonAsync("/api/models", Share(0));
        Assert.Equal(HttpStatusCode.Created, post.StatusCode);
    }

    [Fact]
    public async Task Every_share_acknowledged_before_a_kill_9_is_there_after_the_restart()
    {
        var acknowledged = new System.Collections.Concurrent.ConcurrentDictionary<string, string>();
        int n = 0;
        for (int round = 0; round < 3; round++)
        {
            using var app = AppProcess.Start(In("snapshots.db"), In("catalog.db"));
            Assert.True(await app.ReadyAsync(StartLimit), app.Output);
            foreach (var (id, notes) in acknowledged) // everything acknowledged in earlier rounds reads back
            {
                var got = await app.Client.GetFromJsonAsync<JsonElement>($"/api/models/{id}");
                Assert.Equal(notes, got.GetProperty("notes").GetString());
            }
            using var stop = new CancellationTokenSource();
            var clients = Enumerable.Range(0, 4).Select(_ => Task.Run(async () =>
            {
                while (!stop.IsCancellationRequested)
                {
                    int k = Interlocked.Increment(ref n);
                    try
                    {
                        var r = await app.Client.PostAsJsonAsync("/api/models", Share(k), stop.Token);
                        if (r.StatusCode != HttpStatusCode.Created) continue;
                        var body = await r.Content.ReadFromJsonAsync<JsonElement>(stop.Token);
                        acknowledged[body.GetProperty("id").GetString()!] = $"share {k}";
                    }
                    catch (Exception e) when (e is HttpRequestException or OperationCanceledException or IOException) { }
                }
            })).ToArray();
            var wanted = acknowledged.Count + 8;
            for (int wait = 0; wait < 300 && acknowledged.Count < wanted; wait++) await Task.Delay(100);
            app.KillHard(); // mid-save: the clients are still posting
            await stop.CancelAsync();
            await Task.WhenAll(clients);
        }
        Assert.True(acknowledged.Count >= 10, $"only {acknowledged.Count} shares were acknowledged");
        var store = SnapshotStore.Open(In("snapshots.db"));
        foreach (var (id, notes) in acknowledged) Assert.Equal(notes, store.Find(id)!.Notes);
        Assert.True(store.Verify().Sound, string.Join("\n", store.Verify().Problems));
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
