using Microsoft.Playwright;

namespace ExprModel.EndToEnd.Tests;

/// <summary>The Workbench's "why and what-if" area in the browser: one click ranks what sets the rheobase and draws the tornado.</summary>
[Collection("app")]
public sealed class WhatIfTests(AppFixture app)
{
    [Fact]
    public async Task Which_entries_set_the_rheobase_draws_the_tornado()
    {
        var (context, page, errors) = await WorkbenchTests.OpenPresetAsync(app, "cortex-rs2008");
        var area = page.Locator("[data-testid=whatif]");
        await area.ScrollIntoViewIfNeededAsync();
        await page.Locator("[data-testid=kd-rheobase]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=tornado]", new PageWaitForSelectorOptions { Timeout = 120_000 });
        // The tornado is drawn by the plot library: its bars are SVG paths inside the figure (a zero-length bar is
        // attached but not visible, hence Attached).
        await page.WaitForSelectorAsync("[data-testid=tornado] .main-svg .barlayer path",
            new PageWaitForSelectorOptions { Timeout = 10_000, State = WaitForSelectorState.Attached });
        Assert.Equal("rheobase", await page.Locator("[data-testid=tornado]").GetAttributeAsync("data-readout"));
        Assert.Equal(4, await page.Locator("[data-testid=kd-table] tbody tr").CountAsync());
        Assert.Contains("Research use only", await area.Locator("[data-testid=whatif-caution]").InnerTextAsync());
        await page.WaitForTimeoutAsync(500);
        await area.ScreenshotAsync(new LocatorScreenshotOptions { Path = Path.Combine(app.ScreenshotDir, "workbench-whatif-tornado.png") });
        Assert.True(errors.Count == 0, string.Join("\n", errors));
        await context.CloseAsync();
    }
}
