using Microsoft.Playwright;

namespace ExprModel.EndToEnd.Tests;

/// <summary>Visits every page, saves a screenshot of each to TestResults/screenshots, and fails on browser console errors.</summary>
[Collection("app")]
public sealed class PageTourTests(AppFixture app)
{
    [Theory]
    [InlineData("/", "overview")]
    [InlineData("/load", "load-empty")]
    [InlineData("/map", "map-empty")]
    [InlineData("/catalog", "catalog")]
    [InlineData("/catalog/wb-na-1996", "catalog-entry")]
    [InlineData("/m/AAAAAAAAAAAAAAAAAAAAAA", "shared-missing")]
    public async Task Page_renders_without_browser_errors(string path, string name)
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, path);
        await page.WaitForTimeoutAsync(800);
        await app.ScreenshotAsync(page, name);
        Assert.Empty(errors);
        Assert.Equal(1, await page.Locator("h1").CountAsync());
        await context.CloseAsync();
    }
}
