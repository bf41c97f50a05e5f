using ExprModel.Core.Analysis;
using ExprModel.Core.Export;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Data.Catalog;
using ExprModel.Data.Store;
using ExprModel.Web.Components.Panels;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>The Workbench's state and live loop driven without a renderer, with the real catalog, simulator and read-outs.</summary>
public sealed class WorkbenchSessionTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-session-" + Guid.NewGuid().ToString("N"));
    private readonly ChannelCatalog _catalog;
    private readonly ModelRunner _runner;
    private readonly SnapshotStore _store;
    private readonly WorkspaceState _workspace = new();
    private int _changes;

    public WorkbenchSessionTests()
    {
        Directory.CreateDirectory(_dir);
        _catalog = CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db"));
        _runner = new ModelRunner(_catalog, new SimulationGate(Options.Create(new WebOptions())));
        _store = SnapshotStore.Open(Path.Combine(_dir, "snapshots.db"));
    }

    private WorkbenchSession NewSession() => new(_runner, _workspace, _catalog, () => { Interlocked.Increment(ref _changes); return Task.CompletedTask; });

    /// <summary>The unseeded read-outs of the library's one extractor, with the live settings, on the model the controls describe.</summary>
    private IReadOnlyList<(string Name, string Unit, double? Value)> Cold(ModelDocument doc) =>
        Features.Measure(_runner.Compile(doc), ReadoutSettings.Live).Rows().ToArray();

    private static void AssertSameReadouts(IReadOnlyList<(string Name, string Unit, double? Value)> expected, IReadOnlyList<ReadoutRow>? shown)
    {
        Assert.NotNull(shown);
        Assert.Equal(expected.Select(r => r.Name), shown.Select(r => r.Name));
        foreach (var (e, s) in expected.Zip(shown)) Assert.True(e.Value.Equals(s.Value), $"{e.Name}: measured {e.Value}, shown {s.Value}");
    }

    [Fact]
    public async Task Opening_a_preset_and_moving_a_density_shows_the_cold_readouts_of_each_setting()
    {
        using var session = NewSession();
        session.OpenInitial("wb1996");
        await session.LiveRun;
        Assert.Null(session.Error);
        Assert.Empty(session.Table.Pending);
        AssertSameReadouts(Cold(session.Current()), session.Table.Rows);
        // The step was sized to the opened cell: twice its rheobase, to two significant figures.
        Assert.Equal(StepSizing.FromRheobase(session.Table.Rows!.First(r => r.Name == "rheobase").Value!.Value), session.AmplitudeUaPerCm2);
        Assert.Equal(session.AmplitudeUaPerCm2, session.Step!.Protocol.AmplitudeUaPerCm2);
        Assert.True(_changes > 0, "the page was never told to redraw");

        int k = session.Model!.Channels.Select(c => c.Entry).ToList().IndexOf("wb-k-1996");
        session.SetRelative(k, DensityScale.RelativeAt(700));
        await session.LiveRun;
        Assert.Equal(DensityScale.RelativeAt(700), session.Current().Channels[k].RelativeDensity);
        AssertSameReadouts(Cold(session.Current()), session.Table.Rows);
        Assert.Equal(2, session.Table.CompleteCount);
    }

    [Fact]
    public async Task A_newer_setting_cancels_the_run_before_it()
    {
        using var session = NewSession();
        session.OpenInitial("wb1996");
        var opened = session.LiveRun;
        int na = session.Model!.Channels.Select(c => c.Entry).ToList().IndexOf("wb-na-1996");
        session.SetRelative(na, 0);
        await Task.WhenAll(opened, session.LiveRun);
        // Only the last setting's read-outs were shown in full: sodium off, no rheobase.
        Assert.Equal(1, session.Table.CompleteCount);
        Assert.Null(session.Table.Rows!.First(r => r.Name == "rheobase").Value);
        AssertSameReadouts(Cold(session.Current()), session.Table.Rows);
    }

    [Fact]
    public async Task Pinned_variants_keep_their_results_and_take_the_colours_in_turn()
    {
        using var session = NewSession();
        session.OpenInitial("wb1996");
        await session.LiveRun;
        var asOpened = session.Table.Rows;
        session.PinVariant();
        session.SetRelative(0, 0.5);
        await session.LiveRun;
        session.PinVariant();
        Assert.Equal(["#1 as expressed", "#2 wb-na-1996 50%"], session.Variants.Items.Select(v => v.Name));
        Assert.Same(asOpened, session.Variants.Items[0].Readouts);
        var second = session.Variants.Items[1];
        session.RemoveVariant(session.Variants.Items[0]);
        Assert.Equal(second with { Color = "#c8553d" }, Assert.Single(session.Variants.Items));
    }

    [Fact]
    public async Task A_custom_fi_range_runs_in_chunks_and_equals_one_sweep()
    {
        using var session = NewSession();
        session.OpenInitial("wb1996");
        await session.LiveRun;
        session.SetFi("11", (f, x) => f with { Steps = (int)x });
        Assert.True(session.CustomFi);
        await session.FiSweep.Running;
        Assert.Equal(11, session.FiSweep.Done);
        var whole = ModelRunner.Fi(_runner.Compile(session.Current()), session.Fi, CancellationToken.None);
        Assert.Equal(whole.Select(r => r.SpikesInStep), session.FiRows!.Select(r => r.SpikesInStep));
        for (int i = 0; i < whole.Count; i++) Assert.Equal(whole[i].CurrentUaPerCm2, session.FiRows![i].CurrentUaPerCm2, 12);
    }

    [Fact]
    public void A_bad_value_is_refused_and_the_setting_kept()
    {
        using var session = NewSession();
        session.OpenInitial("hh1952");
        double before = session.TemperatureC;
        session.SetTemperature("90");
        Assert.Contains("-5 and 50", session.Error);
        Assert.Equal(before, session.TemperatureC);
    }

    /// <summary>Demo cell FH2046, T-type calcium at slider position 860: spiking is not monotone (see the page test of the same name).</summary>
    [Fact]
    public async Task The_channel_noise_switch_gives_a_seeded_noisy_trace_that_the_share_link_reproduces()
    {
        using var session = NewSession();
        session.OpenInitial("hh1952");
        await session.LiveRun;
        var deterministic = session.Step!.FullVoltageMv;
        session.SetChannelNoise(true);
        await session.LiveRun;
        var noisy = session.Step!.FullVoltageMv;
        Assert.True(session.Protocol.ChannelNoise);
        Assert.NotEqual(deterministic, noisy);
        session.SetNoiseSeed("not a number");
        Assert.Contains("seed", session.Error);

        var snapshots = new SnapshotService(_store, _runner);
        await session.ShareAsync(snapshots, "", storeExpression: false);
        var opened = await snapshots.OpenAsync(session.SharedSnapshotId!, CancellationToken.None);
        Assert.True(opened!.Protocol.Step.ChannelNoise);
        var again = await _runner.StepAsync(opened.Model, opened.Protocol.Step, CancellationToken.None);
        Assert.Equal(noisy, again.FullVoltageMv);
    }

    [Fact]
    public async Task A_cell_with_a_gap_in_its_spiking_shows_the_cold_readouts_and_sharing_changes_nothing()
    {
        var src = CatalogLocator.FindSourceDirectory()!;
        var data = ExpressionDataset.Read(_catalog.ForMapping(), Path.Combine(src, "demo", "counts.csv"), new ExpressionReadOptions());
        var doc = data.Build(data.Map(), new DensityRule(), ModelTarget.ForCell("FH2046")).Document;
        _workspace.Open(doc, "demo cell FH2046");
        using var session = NewSession();
        session.OpenInitial(null);
        await session.LiveRun;
        session.SetRelative(doc.Channels.Select(c => c.Entry).ToList().IndexOf("cav3-t-destexhe1996"), DensityScale.RelativeAt(860));
        await session.LiveRun;
        AssertSameReadouts(Cold(session.Current()), session.Table.Rows);

        var shown = session.Table.Rows;
        await session.ShareAsync(new SnapshotService(_store, _runner), "", storeExpression: false);
        Assert.NotNull(session.SharedSnapshotId);
        Assert.Null(session.ShareNote);
        Assert.Same(shown, session.Table.Rows);
    }

    /// <summary>
    /// As the page test of the same name: the runner's cache is given altered read-outs for the moved model, so the live
    /// table differs from what the link stores.
    /// </summary>
    [Fact]
    public async Task Sharing_a_live_table_that_differs_from_the_stored_one_shows_the_stored_values_and_what_changed()
    {
        using var session = NewSession();
        session.OpenInitial("cortex-rs2008");
        await session.LiveRun;
        int k = session.Model!.Channels.Select(c => c.Entry).ToList().IndexOf("kv7-m-yamada");
        var moved = session.Current() with
        {
            Channels = session.Current().Channels.Select((c, i) => i == k ? c with { RelativeDensity = DensityScale.RelativeAt(700) } : c).ToArray(),
        };
        var real = ModelRunner.Readouts(_runner.Compile(moved), CancellationToken.None);
        double rheobase = real.Value("rheobase")!.Value;
        _runner.Adopt(moved, real with { Rows = real.Rows.Select(r => r.Name == "rheobase" ? r with { Value = rheobase * 1.5 } : r).ToArray() });

        session.SetRelative(k, DensityScale.RelativeAt(700));
        await session.LiveRun;
        Assert.Equal(rheobase * 1.5, session.Table.Rows!.First(r => r.Name == "rheobase").Value);

        await session.ShareAsync(new SnapshotService(_store, _runner), "", storeExpression: false);
        Assert.Equal(real.Rows, session.Table.Rows);
        Assert.Contains($"rheobase {ReadoutDisplay.Format(rheobase * 1.5, "uA/cm2")} uA/cm2 → {ReadoutDisplay.Format(rheobase, "uA/cm2")} uA/cm2",
            session.ShareNote);
        // A new setting clears the note: it described the table at the moment of sharing.
        session.SetRelative(k, DensityScale.RelativeAt(690));
        Assert.Null(session.ShareNote);
        await session.LiveRun;
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
