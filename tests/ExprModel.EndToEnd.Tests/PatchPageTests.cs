namespace ExprModel.EndToEnd.Tests;

/// <summary>The Patch page in the browser, and the Workbench's channel-noise switch.</summary>
[Collection("app")]
public sealed class PatchPageTests(AppFixture app)
{
    [Fact]
    public async Task A_patch_run_draws_sweeps_mean_dwell_histograms_and_the_variance_parabola()
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, "/patch");
        await page.Locator("[data-testid=nav-patch]").WaitForAsync();
        await page.Locator("[data-testid=patch-sweeps]").FillAsync("60");
        await page.Locator("[data-testid=patch-sweeps]").PressAsync("Tab");
        await page.Locator("[data-testid=patch-run]").ClickAsync();
        await page.WaitForSelectorAsync("[data-testid=patch-summary]", new() { Timeout = 60_000 });
        foreach (var plot in new[] { "patch-sweeps", "patch-mean", "patch-open-dwells", "patch-closed-dwells", "patch-variance" })
            await page.WaitForSelectorAsync($"[data-testid=plot-{plot}] .main-svg .scatterlayer .trace", new() { Timeout = 30_000 });
        Assert.Contains("Research use only", await page.Locator("[data-testid=caution]").InnerTextAsync());
        await app.ScreenshotAsync(page, "patch");
        Assert.Empty(errors);
        await context.CloseAsync();
    }

    [Fact]
    public async Task The_channel_noise_switch_redraws_the_trace_with_stochastic_channels()
    {
        var (context, page, errors) = await app.NewPageAsync();
        await app.GotoAsync(page, "/workbench?preset=hh1952");
        await page.WaitForSelectorAsync("[data-testid=readouts] tbody tr", new() { Timeout = 60_000 });
        await page.Locator("[data-testid=channel-noise]").CheckAsync();
        await page.WaitForSelectorAsync("[data-testid=channel-noise-note]", new() { Timeout = 30_000 });
        await page.WaitForTimeoutAsync(1500);
        await app.ScreenshotAsync(page, "workbench-channel-noise");
        Assert.Empty(errors);
        await context.CloseAsync();
    }
}
