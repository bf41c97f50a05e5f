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
        // An unknown shared model answers 404 by design; the browser logs that status as a console error.
        Assert.DoesNotContain(errors, e => !(name == "shared-missing" && e.Contains("404", StringComparison.Ordinal)));
        Assert.Equal(1, await page.Locator("h1").CountAsync());
        await context.CloseAsync();
    }
}

[Collection("app")]
public sealed class CatalogPageTests(AppFixture app)
{
    [Fact]
    public async Task Searching_by_gene_finds_its_entry_and_its_curves_follow_the_temperature()
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, "/catalog");
        int all = await page.Locator("[data-testid=catalog-entries] li").CountAsync();
        await page.Locator("[data-testid=catalog-search]").FillAsync("kcnc1");
        await page.WaitForFunctionAsync($"() => document.querySelectorAll('[data-testid=catalog-entries] li').length < {all}");
        var items = await page.Locator("[data-testid=catalog-entries] li").AllInnerTextsAsync();
        Assert.NotEmpty(items);
        Assert.All(items, i => Assert.Contains("KCNC1", i, StringComparison.OrdinalIgnoreCase));
        await page.Locator("[data-testid=catalog-entries] li a").First.ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=entry-name]");
        Assert.Contains("KCNC1", await page.Locator("[data-testid=entry-genes]").InnerTextAsync(), StringComparison.OrdinalIgnoreCase);
        Assert.Matches("parameters checked|parameters recalled", await page.Locator("[data-testid=verification]").InnerTextAsync());
        Assert.Matches("citation (confirmed|unchecked|: no abstract page found)", await page.Locator("[data-testid=citation-check]").InnerTextAsync());
        await page.WaitForSelectorAsync("[data-testid=plot-tau] .main-svg .scatterlayer .trace");
        await page.Locator("[data-testid=curve-temperature]").FillAsync("20");
        await page.Locator("[data-testid=curve-temperature]").PressAsync("Enter");
        await page.WaitForFunctionAsync("() => document.querySelector('[data-testid=plot-tau]').innerText.includes('20 °C')");
        await app.ScreenshotAsync(page, "catalog-search");
        Assert.Empty(errors);
        await context.CloseAsync();
    }
}
