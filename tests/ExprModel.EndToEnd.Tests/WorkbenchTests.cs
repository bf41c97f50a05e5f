using Microsoft.Playwright;

namespace ExprModel.EndToEnd.Tests;

/// <summary>The Workbench from a published model: sliders move read-outs; sharing gives a link that reproduces them elsewhere.</summary>
[Collection("app")]
public sealed class WorkbenchTests(AppFixture app)
{
    /// <summary>How many times every read-out has been measured (first-stage updates, shown while the f-I curve runs, do not count).</summary>
    internal static async Task<int> UpdateCount(IPage page) =>
        int.Parse(await page.Locator("[data-testid=readouts]").GetAttributeAsync("data-complete-update") ?? "0");

    /// <summary>A new browser context with the Workbench open on a published model, its read-outs measured once.</summary>
    internal static async Task<(IBrowserContext Context, IPage Page, List<string> ConsoleErrors)> OpenPresetAsync(AppFixture app, string preset)
    {
        var opened = await app.NewPageAsync();
        await app.GotoAsync(opened.Page, "/workbench?preset=" + preset);
        await WaitForUpdateAfter(opened.Page, 0);
        return opened;
    }

    internal static async Task WaitForUpdateAfter(IPage page, int before) =>
        await page.WaitForFunctionAsync($"() => Number(document.querySelector('[data-testid=readouts]')?.dataset.completeUpdate ?? 0) > {before}");

    internal static async Task<Dictionary<string, string>> ReadoutValues(IPage page, string column = "now")
    {
        var headers = await page.Locator("[data-testid=readouts] thead th").AllInnerTextsAsync();
        int col = headers.ToList().IndexOf(column);
        var result = new Dictionary<string, string>();
        foreach (var row in await page.Locator("[data-testid=readouts] tbody tr").AllAsync())
        {
            var cells = await row.Locator("td").AllInnerTextsAsync();
            result[cells[0]] = cells[col];
        }
        return result;
    }

    [Fact]
    public async Task Moving_a_density_slider_changes_the_readouts()
    {
        var (context, page, errors) = await OpenPresetAsync(app, "wb1996");
        await page.WaitForSelectorAsync("[data-testid=plot-fi] .main-svg");
        await page.WaitForTimeoutAsync(1500);
        await app.ScreenshotAsync(page, "workbench-preset");
        var before = await ReadoutValues(page);
        Assert.NotEmpty(before);

        int count = await UpdateCount(page);
        // Potassium delayed rectifier down to a few percent: the cell fires differently.
        await page.Locator("[data-testid=slider-wb-k-1996] input[type=range]").FillAsync("250");
        await WaitForUpdateAfter(page, count);
        var after = await ReadoutValues(page);
        Assert.NotEqual(before, after);
        Assert.Contains("%", await page.Locator("[data-testid=slider-wb-k-1996] output").InnerTextAsync());
        Assert.DoesNotContain("100%", await page.Locator("[data-testid=slider-wb-k-1996] output").InnerTextAsync());

        // Reset brings the as-expressed read-outs back exactly.
        count = await UpdateCount(page);
        await page.Locator("[data-testid=reset-all]").ClickAsync();
        await WaitForUpdateAfter(page, count);
        Assert.Equal(before, await ReadoutValues(page));
        Assert.Contains("Research use only", await page.Locator("[data-testid=caution]").InnerTextAsync());
        Assert.Empty(errors);
        await context.CloseAsync();
    }

    /// <summary>
    /// A new slider value drops the queued redraws of the phase plane and the currents (the run it starts sends fresh
    /// ones). After a burst of moves, every plot must still end up drawn with the newest run's data: each figure's
    /// data-shown (set by the page's plot queue after drawing) equals its data-revision (set by the server).
    /// </summary>
    [Fact]
    public async Task After_a_burst_of_slider_moves_every_plot_shows_the_newest_run()
    {
        var (context, page, errors) = await OpenPresetAsync(app, "wb1996");
        await page.WaitForSelectorAsync("[data-testid=plot-currents] .main-svg");
        int count = await UpdateCount(page);
        string[] keys = ["voltage", "fi", "phase", "currents"];
        var revisionsBefore = new Dictionary<string, string?>();
        foreach (var k in keys) revisionsBefore[k] = await page.Locator($"[data-testid=plot-{k}]").GetAttributeAsync("data-revision");

        // Six values 40 ms apart on the sodium channel: each cancels the run before it, some land while plots are queued.
        await page.EvaluateAsync("""
            async () => {
              const input = document.querySelector('[data-testid=slider-wb-na-1996] input[type=range]');
              for (const v of [700, 760, 820, 880, 840, 800]) {
                input.value = String(v);
                input.dispatchEvent(new Event('input', { bubbles: true }));
                await new Promise(r => setTimeout(r, 40));
              }
            }
            """);
        await WaitForUpdateAfter(page, count);
        await page.WaitForFunctionAsync("""
            () => ['voltage', 'fi', 'phase', 'currents'].every(k => {
              const f = document.querySelector('[data-testid=plot-' + k + ']');
              return f && f.getAttribute('data-shown') === f.getAttribute('data-revision');
            })
            """, null, new PageWaitForFunctionOptions { Timeout = 20_000 });
        foreach (var k in keys)
            Assert.NotEqual(revisionsBefore[k], await page.Locator($"[data-testid=plot-{k}]").GetAttributeAsync("data-revision"));
        Assert.Empty(errors);
        await context.CloseAsync();
    }

    [Fact]
    public async Task A_share_link_reproduces_the_readouts_in_a_fresh_browser()
    {
        var (context, page, errors) = await OpenPresetAsync(app, "cortex-rs2008");
        int count = await UpdateCount(page);
        await page.Locator("[data-testid=slider-kv7-m-yamada] input[type=range]").FillAsync("900");
        await WaitForUpdateAfter(page, count);
        var shown = await ReadoutValues(page);
        await page.Locator("[data-testid=share-notes]").FillAsync("M-current raised; does adaptation grow?");
        await page.Locator("[data-testid=share]").ClickAsync();
        var link = await page.Locator("[data-testid=share-link]").InnerTextAsync();
        Assert.Matches(@"/m/[A-Za-z0-9_-]{22}$", link);
        await app.ScreenshotAsync(page, "workbench-shared");
        await context.CloseAsync();

        // A different browser context: no cookies, no circuit, nothing shared but the link.
        var (fresh, page2, errors2) = await app.NewPageAsync();
        await page2.GotoAsync(link);
        await page2.WaitForSelectorAsync("[data-testid=reproduced]");
        await page2.WaitForSelectorAsync("[data-testid=plot-shared-voltage] .main-svg .scatterlayer .trace");
        await app.ScreenshotAsync(page2, "shared-model");
        Assert.Contains("matches the saved values exactly", await page2.Locator("[data-testid=reproduced]").InnerTextAsync());
        Assert.Equal(shown, await ReadoutValues(page2, "re-run now"));
        Assert.Equal(shown, await ReadoutValues(page2, "saved"));
        Assert.Contains("adaptation grow", await page2.Locator("[data-testid=shared-notes]").InnerTextAsync());
        Assert.Contains("Research use only", await page2.Locator("[data-testid=caution]").InnerTextAsync());

        // Editing the shared model and sharing again records the parent.
        await page2.Locator("[data-testid=open-workbench]").ClickAsync();
        await WaitForUpdateAfter(page2, 0);
        Assert.Equal(shown, await ReadoutValues(page2));
        await page2.Locator("[data-testid=share]").ClickAsync();
        var link2 = await page2.Locator("[data-testid=share-link]").InnerTextAsync();
        Assert.NotEqual(link, link2);
        await page2.GotoAsync(link2);
        await page2.WaitForSelectorAsync("[data-testid=parent-link]");
        Assert.Empty(errors);
        Assert.Empty(errors2);
        await fresh.CloseAsync();
    }
}

/// <summary>Exports carry the research-use caution; an exported model imports back to the same read-outs.</summary>
[Collection("app")]
public sealed class ExportTests(AppFixture app)
{
    private static async Task<string> DownloadText(IPage page, string selector)
    {
        var download = await page.RunAndWaitForDownloadAsync(() => page.Locator(selector).ClickAsync());
        var path = await download.PathAsync();
        return await File.ReadAllTextAsync(path!);
    }

    [Fact]
    public async Task Csv_and_json_exports_carry_the_caution_and_the_model_imports_back()
    {
        var (context, page, errors) = await WorkbenchTests.OpenPresetAsync(app, "hh1952");
        var shown = await WorkbenchTests.ReadoutValues(page);

        var csv = await DownloadText(page, "text=read-outs CSV");
        Assert.StartsWith("# Research tool.", csv);
        Assert.Contains("\nreadout,unit,now\n", csv);
        Assert.Contains("\nrheobase,uA/cm2,", csv);

        var trace = await DownloadText(page, "text=trace CSV");
        Assert.StartsWith("# Research tool.", trace);
        Assert.Contains("time_ms,voltage_mv,stimulus_ua_per_cm2", trace);

        var json = await DownloadText(page, "[data-testid=export-model]");
        Assert.Contains("\"caution\": \"Research tool.", json);
        Assert.Contains("\"version\": 1", json);

        // Import the exported file into a fresh page: same read-outs.
        var file = Path.Combine(app.WorkDir, "exported.model.json");
        await File.WriteAllTextAsync(file, json);
        var (fresh, page2, errors2) = await app.NewPageAsync();
        await app.GotoAsync(page2, "/workbench?preset=wb1996");
        await WorkbenchTests.WaitForUpdateAfter(page2, 0);
        int count = await WorkbenchTests.UpdateCount(page2);
        await page2.Locator("[data-testid=import-model]").SetInputFilesAsync(file);
        await WorkbenchTests.WaitForUpdateAfter(page2, count);
        await page2.WaitForFunctionAsync("() => document.querySelector('[data-testid=model-name]').innerText.includes('imported')");
        Assert.Equal(shown, await WorkbenchTests.ReadoutValues(page2));

        // A broken model file is refused with its line and position.
        var broken = Path.Combine(app.WorkDir, "broken.model.json");
        await File.WriteAllTextAsync(broken, "{ \"format\": \"exprmodel-model\", \"schemaVersion\": 1, \"cell\": ");
        await page2.Locator("[data-testid=import-model]").SetInputFilesAsync(broken);
        var error = await page2.WaitForSelectorAsync("[data-testid=error]");
        Assert.Contains("broken.model.json", await error!.InnerTextAsync());
        Assert.Empty(errors);
        Assert.Empty(errors2);
        await context.CloseAsync();
        await fresh.CloseAsync();
    }
}
