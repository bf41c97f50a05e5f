using Microsoft.Playwright;

namespace ExprModel.EndToEnd.Tests;

/// <summary>The adaptation-mechanisms panel and the paper-ready exports (methods paragraph, BibTeX) in the browser.</summary>
[Collection("app")]
public sealed class PaperTests(AppFixture app)
{
    private static async Task<string> DownloadText(IPage page, string selector)
    {
        var download = await page.RunAndWaitForDownloadAsync(() => page.Locator(selector).ClickAsync());
        return await File.ReadAllTextAsync((await download.PathAsync())!);
    }

    [Fact]
    public async Task The_mechanisms_panel_names_the_M_current_and_exports_its_table()
    {
        // Pospischil et al. 2008: the regular-spiking model adapts through its M-current (common practice: it builds up over a train).
        var (context, page, errors) = await WorkbenchTests.OpenPresetAsync(app, "cortex-rs2008");
        var panel = page.Locator("[data-testid=mechanisms]");
        await panel.ScrollIntoViewIfNeededAsync();
        await page.Locator("[data-testid=mechanisms-run]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=mechanisms-summary]", new PageWaitForSelectorOptions { Timeout = 120_000 });
        Assert.Contains("kv7-m-yamada", await page.Locator("[data-testid=mechanisms-summary]").InnerTextAsync());
        Assert.Contains("Research", await panel.InnerTextAsync());
        await page.WaitForSelectorAsync("[data-testid=plot-mech-currents] .main-svg .scatterlayer .trace");
        var csv = await DownloadText(page, "[data-testid=mechanisms-csv]");
        Assert.StartsWith("# Research tool.", csv);
        Assert.Contains("ramp_current_kv7-m-yamada_ua_per_cm2", csv);
        await page.WaitForTimeoutAsync(500);
        await panel.ScreenshotAsync(new LocatorScreenshotOptions { Path = Path.Combine(app.ScreenshotDir, "workbench-mechanisms.png") });
        Assert.True(errors.Count == 0, string.Join("\n", errors));
        await context.CloseAsync();
    }

    // Timed out in full-suite runs on loaded machines: the shared page was clicked while only prerendered (no handlers yet),
    // so the download never came. Buttons are now disabled until the page is live, and the test waits for that.
    [Fact]
    public async Task Methods_and_BibTeX_download_from_the_Workbench_and_a_shared_model()
    {
        var (context, page, errors) = await WorkbenchTests.OpenPresetAsync(app, "wb1996");
        // Sharing saves the measured read-outs and the shared page re-runs them: on a loaded 2-core CI machine that
        // took longer than the 30 s default once (CI stop 22), so this flow gets the budget the other share flows have.
        page.SetDefaultTimeout(120_000);
        string methods = await DownloadText(page, "[data-testid=export-methods]");
        // Wang & Buzsaki 1996 (J Neurosci 16:6402): both active channels cite it.
        Assert.Contains("[Wang1996]", methods);
        Assert.Contains("clinical", methods);
        string bib = await DownloadText(page, "[data-testid=export-bibtex]");
        Assert.Contains("@article{Wang1996,", bib);

        await page.Locator("[data-testid=share]").ClickAsync();
        var link = await (await page.WaitForSelectorAsync("[data-testid=share-link]"))!.GetAttributeAsync("href");
        await page.GotoAsync(link!);
        await AppFixture.WaitUntilLiveAsync(page);
        await page.WaitForSelectorAsync("[data-testid=shared-methods]:not([disabled])");
        string shared = await DownloadText(page, "[data-testid=shared-methods]");
        Assert.Contains("[Wang1996]", shared);
        Assert.Contains("@article{Wang1996,", await DownloadText(page, "[data-testid=shared-bibtex]"));
        await app.ScreenshotAsync(page, "shared-model-exports");
        Assert.True(errors.Count == 0, string.Join("\n", errors));
        await context.CloseAsync();
    }

    [Fact]
    public async Task The_catalog_page_shows_both_gate_forms_and_parameter_counts()
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, "/catalog/squid-k-hh1952");
        await page.WaitForSelectorAsync("[data-testid=gate-forms-n] table");
        Assert.Contains("alpha/(alpha + beta)", await page.Locator("[data-testid=gate-forms-n]").InnerTextAsync());
        Assert.Contains("6 parameters", await page.Locator("[data-testid=parameter-count]").InnerTextAsync());
        // The screenshot must show the curves: wait for a drawn line (a path with points) in both gate plots.
        foreach (var plot in new[] { "steady", "tau" })
            await page.WaitForFunctionAsync($"() => [...document.querySelectorAll('[data-testid=plot-{plot}] .scatterlayer .trace path.js-line')]"
                + ".some(p => (p.getAttribute('d') ?? '').length > 20)");
        await app.ScreenshotAsync(page, "catalog-gate-forms");
        Assert.True(errors.Count == 0, string.Join("\n", errors));
        await context.CloseAsync();
    }
}
