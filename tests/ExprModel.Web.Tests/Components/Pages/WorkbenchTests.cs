using Bunit;
using ExprModel.Data.Catalog;
using ExprModel.Data.Store;
using ExprModel.Web.Components.Pages;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.AspNetCore.Components;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Tests.Components.Pages;

/// <summary>The Workbench page with the real catalog, simulator and read-outs (no browser; plots are not drawn).</summary>
public sealed class WorkbenchTests : BunitContext
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-bunit-" + Guid.NewGuid().ToString("N"));

    public WorkbenchTests()
    {
        JSInterop.Mode = JSRuntimeMode.Loose;
        Directory.CreateDirectory(_dir);
        var options = Options.Create(new WebOptions());
        Services.AddSingleton(options);
        Services.AddSingleton(CatalogLocator.Ensure(Path.Combine(_dir, "catalog.db")));
        Services.AddSingleton(SnapshotStore.Open(Path.Combine(_dir, "snapshots.db")));
        Services.AddSingleton<SimulationGate>();
        Services.AddSingleton<ModelRunner>();
        Services.AddSingleton<SnapshotService>();
        Services.AddScoped<WorkspaceState>();
        SetRendererInfo(new RendererInfo("Server", isInteractive: true)); // a live circuit, as in the browser
    }

    private IRenderedComponent<Workbench> Open(string preset)
    {
        Services.GetRequiredService<NavigationManager>().NavigateTo($"workbench?preset={preset}");
        var cut = Render<Workbench>();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=readouts] tbody tr")), TimeSpan.FromSeconds(60));
        return cut;
    }

    /// <summary>How many times every read-out has been measured (a first stage shown early does not count).</summary>
    private static int Completed(IRenderedComponent<Workbench> cut) => int.Parse(cut.Find("[data-testid=readouts]").GetAttribute("data-complete-update")!);

    /// <summary>Waits for the opened model's read-outs, moves a channel's slider and waits until every read-out is in for the new position.</summary>
    private static void MoveAndWait(IRenderedComponent<Workbench> cut, string entry, string position)
    {
        cut.WaitForAssertion(() => Assert.True(Completed(cut) > 0), TimeSpan.FromSeconds(60));
        int before = Completed(cut);
        cut.Find($"[data-testid=slider-{entry}] input").Input(position);
        cut.WaitForAssertion(() => Assert.True(Completed(cut) > before), TimeSpan.FromSeconds(60));
    }

    /// <summary>Shares the current model and checks that the table stays as it was (no note, no new update).</summary>
    private static void ShareAndExpectNoChange(IRenderedComponent<Workbench> cut)
    {
        int shown = int.Parse(cut.Find("[data-testid=readouts]").GetAttribute("data-update")!);
        cut.Find("[data-testid=share]").Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=share-link]")), TimeSpan.FromSeconds(60));
        Assert.Empty(cut.FindAll("[data-testid=share-note]"));
        Assert.Equal(shown, int.Parse(cut.Find("[data-testid=readouts]").GetAttribute("data-update")!));
    }

    private static string Value(IRenderedComponent<Workbench> cut, string readout) =>
        cut.Find($"tr[data-readout={readout}]").QuerySelectorAll("td")[1].TextContent;

    [Fact]
    public void One_slider_per_channel_starting_at_as_expressed()
    {
        var cut = Open("cortex-rs2008");
        var sliders = cut.FindAll(".density-slider");
        Assert.Equal(4, sliders.Count);
        Assert.All(sliders, s => Assert.Equal("100%", s.QuerySelector("output")!.TextContent));
        Assert.Contains("Research use only", cut.Find("[data-testid=caution]").TextContent);
        Assert.Contains("Regular-spiking", cut.Find("[data-testid=model-name]").TextContent);
    }

    [Fact]
    public void Switching_sodium_off_changes_the_readouts()
    {
        var cut = Open("wb1996");
        // Let the opened model's read-outs finish (its second stage also counts as an update) before moving the slider.
        cut.WaitForAssertion(() => Assert.True(Completed(cut) > 0), TimeSpan.FromSeconds(60));
        var rheobase = Value(cut, "rheobase");
        Assert.NotEqual("—", rheobase);
        int before = int.Parse(cut.Find("[data-testid=readouts]").GetAttribute("data-update")!);
        cut.Find("[data-testid=slider-wb-na-1996] input").Input("0");
        cut.WaitForAssertion(() => Assert.True(int.Parse(cut.Find("[data-testid=readouts]").GetAttribute("data-update")!) > before), TimeSpan.FromSeconds(60));
        Assert.Equal("off", cut.Find("[data-testid=slider-wb-na-1996] output").TextContent);
        Assert.NotEqual(rheobase, Value(cut, "rheobase"));
        // The server's share of the update, for the browser benchmark: the trace is awaited before the first read-outs.
        var p = cut.Find("[data-testid=spike-count]");
        double trace = double.Parse(p.GetAttribute("data-server-trace-ms")!, System.Globalization.CultureInfo.InvariantCulture);
        double first = double.Parse(p.GetAttribute("data-server-first-ms")!, System.Globalization.CultureInfo.InvariantCulture);
        Assert.InRange(trace, 0.05, first);
    }

    [Fact]
    public void Live_readouts_after_a_slider_move_equal_a_cold_measurement_of_the_same_model()
    {
        // The live loop shows a first stage early and seeds the rheobase search with the previous value; once every
        // read-out is in, the table must hold exactly what a fresh, unseeded measurement of that model gives.
        var cut = Open("cortex-rs2008");
        MoveAndWait(cut, "kv7-m-yamada", "820");
        Assert.Empty(cut.FindAll("[data-testid=readouts] td.pending"));

        var catalog = Services.GetRequiredService<ChannelCatalog>();
        var preset = catalog.Preset("cortex-rs2008");
        var moved = preset with
        {
            Channels = preset.Channels.Select(c => c.Entry == "kv7-m-yamada"
                ? c with { RelativeDensity = ExprModel.Web.Components.Panels.DensityScale.RelativeAt(820) } : c).ToArray(),
        };
        var runner = Services.GetRequiredService<ModelRunner>();
        var cold = ModelRunner.Readouts(runner.Compile(moved), CancellationToken.None);
        foreach (var row in cold.Rows)
            Assert.Equal(ExprModel.Core.Export.ReadoutDisplay.Format(row.Value, row.Unit), Value(cut, row.Name));
    }

    /// <summary>
    /// Demo cell FH2046 with its T-type calcium channel (cav3-t-destexhe1996) moved to slider position 860: spiking is not
    /// monotone in the step amplitude. A search seeded from the opened cell's rheobase (which FH2046 no longer gives, since
    /// its own spiking has a gap) found a rheobase where an unseeded search finds none. The live table must now equal
    /// the unseeded measurement, and sharing it must change nothing.
    /// </summary>
    [Fact]
    public void A_cell_with_a_gap_in_its_spiking_seeds_no_search_so_the_live_table_equals_the_shared_one()
    {
        var catalog = Services.GetRequiredService<ChannelCatalog>();
        var src = CatalogLocator.FindSourceDirectory()!;
        var data = ExprModel.Core.Mapping.ExpressionDataset.Read(catalog.ForMapping(), Path.Combine(src, "demo", "counts.csv"),
            new ExprModel.Core.Expression.ExpressionReadOptions());
        var doc = data.Build(data.Map(), new ExprModel.Core.Mapping.DensityRule(), ExprModel.Core.Mapping.ModelTarget.ForCell("FH2046")).Document;
        Services.GetRequiredService<WorkspaceState>().Open(doc, "demo cell FH2046");
        var cut = Render<Workbench>();
        MoveAndWait(cut, "cav3-t-destexhe1996", "860");

        var runner = Services.GetRequiredService<ModelRunner>();
        var moved = doc with
        {
            Channels = doc.Channels.Select(c => c.Entry == "cav3-t-destexhe1996"
                ? c with { RelativeDensity = ExprModel.Web.Components.Panels.DensityScale.RelativeAt(860) } : c).ToArray(),
        };
        var cold = ModelRunner.Readouts(runner.Compile(moved), CancellationToken.None);
        foreach (var row in cold.Rows)
            Assert.Equal(ExprModel.Core.Export.ReadoutDisplay.Format(row.Value, row.Unit), Value(cut, row.Name));

        ShareAndExpectNoChange(cut);
    }

    /// <summary>
    /// When the live table differs from what the link stores, sharing switches the table to the stored read-outs and
    /// says what changed. No known cell gives such a difference any more (see the test above), so the live table is
    /// made to differ: the runner's read-out cache is given a copy of the real read-outs with another rheobase for the
    /// model the slider move produces, and the move shows that copy.
    /// </summary>
    [Fact]
    public void Sharing_a_live_table_that_differs_from_the_stored_one_shows_the_stored_values_and_what_changed()
    {
        var catalog = Services.GetRequiredService<ChannelCatalog>();
        var runner = Services.GetRequiredService<ModelRunner>();
        var preset = catalog.Preset("cortex-rs2008");
        // The model as the Workbench's controls describe it after the move (same text, so the same cache key).
        var moved = preset with
        {
            Channels = preset.Channels.Select(c => c.Entry == "kv7-m-yamada"
                ? c with { RelativeDensity = ExprModel.Web.Components.Panels.DensityScale.RelativeAt(700) } : c).ToArray(),
            Ions = preset.Ions ?? ExprModel.Core.Cell.IonConcentrations.Mammalian,
            Cell = new ExprModel.Core.Models.CellGeometryDocument
            {
                AreaUm2 = preset.Cell.ToGeometry().AreaUm2,
                CapacitanceUfPerCm2 = preset.Cell.CapacitanceUfPerCm2,
            },
        };
        var real = ModelRunner.Readouts(runner.Compile(moved), CancellationToken.None);
        double rheobase = real.Value("rheobase")!.Value;
        var altered = real with { Rows = real.Rows.Select(r => r.Name == "rheobase" ? r with { Value = rheobase * 1.5 } : r).ToArray() };
        runner.Adopt(moved, altered);

        var cut = Open("cortex-rs2008");
        MoveAndWait(cut, "kv7-m-yamada", "700");
        Assert.True(ExprModel.Core.Export.ReadoutDisplay.Format(rheobase * 1.5, "uA/cm2") == Value(cut, "rheobase"),
            "the altered read-outs were not shown: this test's copy of the Workbench's model no longer matches the page's");

        cut.Find("[data-testid=share]").Click();
        cut.WaitForAssertion(() => Assert.NotEmpty(cut.FindAll("[data-testid=share-note]")), TimeSpan.FromSeconds(60));
        foreach (var row in real.Rows)
            Assert.Equal(ExprModel.Core.Export.ReadoutDisplay.Format(row.Value, row.Unit), Value(cut, row.Name));
        var note = cut.Find("[data-testid=share-note]").TextContent;
        Assert.Contains($"rheobase {ExprModel.Core.Export.ReadoutDisplay.Format(rheobase * 1.5, "uA/cm2")} uA/cm2 → "
            + $"{ExprModel.Core.Export.ReadoutDisplay.Format(rheobase, "uA/cm2")} uA/cm2", note);
        Assert.DoesNotContain("spike threshold", note);

        // Moving on clears the note (it described the table at the moment of sharing).
        cut.Find("[data-testid=slider-kv7-m-yamada] input").Input("690");
        cut.WaitForAssertion(() => Assert.Empty(cut.FindAll("[data-testid=share-note]")));
    }

    [Fact]
    public void Sharing_a_published_model_leaves_the_live_table_as_it_is()
    {
        var cut = Open("cortex-rs2008");
        MoveAndWait(cut, "kv7-m-yamada", "700");
        ShareAndExpectNoChange(cut);
    }

    [Fact]
    public void Comparing_groups_can_be_cancelled_and_keeps_what_is_done()
    {
        var catalog = Services.GetRequiredService<ChannelCatalog>();
        var workspace = Services.GetRequiredService<WorkspaceState>();
        foreach (var id in new[] { "hh1952", "wb1996", "cortex-rs2008", "cortex-fs2008" }) workspace.GroupModels[id] = catalog.Preset(id);
        var cut = Open("hh1952");
        cut.Find("[data-testid=compare-groups]").Click();
        cut.WaitForAssertion(() => Assert.NotNull(cut.Find("[data-testid=compare-cancel]")), TimeSpan.FromSeconds(30));
        cut.Find("[data-testid=compare-cancel]").Click();
        cut.WaitForAssertion(() => Assert.NotNull(cut.Find("[data-testid=compare-groups]")), TimeSpan.FromSeconds(30));
        Assert.Empty(cut.FindAll("[data-testid=compare-progress]"));
        Assert.True(cut.FindAll(".variants li").Count < 4, "cancelled before all four groups were pinned");
    }

    [Fact]
    public void An_impossible_temperature_is_refused_with_a_message()
    {
        var cut = Open("hh1952");
        cut.Find("[data-testid=temperature]").Change("90");
        cut.WaitForAssertion(() => Assert.Contains("Temperature", cut.Find("[data-testid=error]").TextContent));
        Assert.Contains("-5 and 50", cut.Find("[data-testid=error]").TextContent);
    }

    [Fact]
    public void A_bad_fi_range_is_refused_with_the_field_named()
    {
        var cut = Open("hh1952");
        cut.Find("[data-testid=fi-steps]").Change("1");
        cut.WaitForAssertion(() => Assert.Contains("fi.steps", cut.Find("[data-testid=error]").TextContent));
    }

    protected override void Dispose(bool disposing)
    {
        base.Dispose(disposing);
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
