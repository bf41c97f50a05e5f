using Microsoft.Playwright;

namespace ExprModel.EndToEnd.Tests;

/// <summary>
/// The demo survey with its invented recordings: every cell's read-outs against the recorded values, then one recorded
/// cell on the Workbench.
/// </summary>
[Collection("app")]
public sealed class RecordingsFlowTests(AppFixture app)
{
    [Fact]
    public async Task Demo_recordings_are_confronted_on_the_map_and_overlaid_on_the_workbench()
    {
        var (context, page, errors) = await app.NewPageAsync();
        page.SetDefaultTimeout(240_000);
        await app.GotoAsync(page, "/load");
        await page.Locator("[data-testid=use-demo]").ClickAsync();
        // 15 demo cells have NWB recordings (catalog/demo/README.md); the metadata's rheobase (pA) column is matched.
        await page.WaitForSelectorAsync("[data-testid=recorded-cells] tr[data-cell=FH5003]");
        Assert.Equal(15, await page.Locator("[data-testid=recorded-cells] tbody tr").CountAsync());
        Assert.Contains("rheobase_absolute", await page.Locator("[data-testid=recorded-match] tr[data-column='rheobase (pA)']").InnerTextAsync());
        Assert.Contains("max firing rate (Hz)", await page.Locator("[data-testid=recorded-match]").InnerTextAsync());
        await app.ScreenshotAsync(page, "load-recordings");

        await page.Locator("[data-testid=to-map]").ClickAsync();
        await page.Locator("[data-testid=build]").ClickAsync();
        Assert.Equal("Group", await page.Locator("[data-testid=cell-batch-shrinkage]").InputValueAsync());
        await page.Locator("[data-testid=cell-batch]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=confrontation]");
        Assert.Contains("shrunk", await page.Locator("[data-testid=cell-batch-estimate]").InnerTextAsync());
        var agreement = await page.Locator("[data-testid=agreement] tr[data-readout=rheobase_absolute]").InnerTextAsync();
        Assert.Contains("pA", agreement);
        Assert.Contains("Research use only", await page.Locator("[data-testid=confrontation]").InnerTextAsync());
        await page.WaitForSelectorAsync("[data-testid=plot-scatter-rheobase_absolute] .scatterlayer .point");
        Assert.True(await page.Locator("[data-testid=confrontation-cells] tbody tr").CountAsync() > 10);
        await page.WaitForTimeoutAsync(1000);
        await page.Locator("[data-testid=confrontation]").ScreenshotAsync(new() { Path = Path.Combine(app.ScreenshotDir, "map-confrontation.png") });

        var download = await page.RunAndWaitForDownloadAsync(() => page.Locator("[data-testid=confrontation-csv]").ClickAsync());
        var csv = await File.ReadAllTextAsync((await download.PathAsync())!);
        Assert.StartsWith("# Research tool.", csv);
        Assert.Contains("cell,group,model,readout,unit,predicted,recorded,difference,z_score", csv);

        await page.Locator("[data-testid=confrontation-cells] tr[data-cell=FH1001] [data-testid=open-cell]").ClickAsync();
        await WorkbenchTests.WaitForUpdateAfter(page, 0);
        Assert.Contains("FH1001", await page.Locator("[data-testid=model-name]").InnerTextAsync());
        Assert.Contains("cell FH1001", await page.Locator("[data-testid=recorded-head]").InnerTextAsync());
        var recordedRheobase = await page.Locator("[data-testid=readouts] tr[data-readout=rheobase_absolute] [data-testid=recorded-value]").InnerTextAsync();
        Assert.NotEqual("—", recordedRheobase);
        await page.WaitForSelectorAsync("[data-testid=plot-recorded-overlay] .scatterlayer .trace:nth-child(2)");
        Assert.Contains("pA =", await page.Locator("[data-testid=overlay-step]").InnerTextAsync());
        await page.WaitForSelectorAsync("[data-testid=plot-voltage][data-shown]");
        await page.WaitForTimeoutAsync(1000);
        await app.ScreenshotAsync(page, "workbench-recorded");

        // The share link keeps the cell's recorded values beside the stored read-outs.
        await page.Locator("[data-testid=share]").ClickAsync();
        var link = await (await page.WaitForSelectorAsync("[data-testid=share-link]"))!.GetAttributeAsync("href");
        await app.GotoAsync(page, new Uri(link!).AbsolutePath);
        await page.WaitForSelectorAsync("[data-testid=shared-recorded]");
        Assert.Equal(recordedRheobase,
            await page.Locator("[data-testid=readouts] tr[data-readout=rheobase_absolute] [data-testid=recorded-value]").InnerTextAsync());
        await page.WaitForTimeoutAsync(1000);
        await app.ScreenshotAsync(page, "shared-recorded");
        Assert.True(errors.Count == 0, string.Join("\n", errors));
        await context.CloseAsync();
    }
}
