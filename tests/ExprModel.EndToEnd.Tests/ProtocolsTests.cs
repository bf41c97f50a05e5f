using Microsoft.Playwright;

namespace ExprModel.EndToEnd.Tests;

/// <summary>The Workbench's protocols area in the browser: each protocol runs, draws its plots and downloads its CSV.</summary>
[Collection("app")]
public sealed class ProtocolsTests(AppFixture app)
{
    [Theory]
    [InlineData("pulse", "plot-protocol-voltage", "time_ms,voltage_mv,stimulus_ua_per_cm2")]
    [InlineData("train", "plot-protocol-voltage", "time_ms,voltage_mv,stimulus_ua_per_cm2")]
    [InlineData("ramp", "plot-protocol-voltage", "time_ms,voltage_mv,stimulus_ua_per_cm2")]
    [InlineData("noise", "plot-protocol-voltage", "time_ms,voltage_mv,stimulus_ua_per_cm2")]
    [InlineData("waveform", "plot-protocol-voltage", "time_ms,voltage_mv,stimulus_ua_per_cm2")]
    [InlineData("clamp", "plot-clamp-inactivation", "command_mv,peak_")]
    public async Task Each_protocol_runs_draws_its_plot_and_downloads_its_csv(string kind, string plot, string header)
    {
        var (context, page, errors) = await WorkbenchTests.OpenPresetAsync(app, "hh1952");
        var area = page.Locator("[data-testid=protocols]");
        await area.ScrollIntoViewIfNeededAsync();
        await page.Locator($"[data-testid=protocol-tab-{kind}]").ClickAsync();
        await page.WaitForSelectorAsync($"[data-testid=protocol-form][data-kind={kind}]");
        if (kind == "waveform")
        {
            var file = Path.Combine(Path.GetTempPath(), $"exprmodel-e2e-waveform-{Guid.NewGuid():N}.csv");
            await File.WriteAllTextAsync(file, "time_ms,current_pa\n0,0\n50,0\n51,300\n150,300\n151,0\n200,0\n");
            await page.Locator("[data-testid=protocol-waveform-file]").SetInputFilesAsync(file);
            await page.WaitForFunctionAsync("() => document.querySelector('[data-testid=protocol-waveform]').innerText.includes('6 samples')");
        }
        if (kind == "clamp") await page.Locator("[data-testid=protocol-field-conditioning]").FillAsync("100");
        if (kind == "clamp") await page.Locator("[data-testid=protocol-field-conditioning]").DispatchEventAsync("change");
        await page.Locator("[data-testid=protocol-run]").ClickAsync();
        await page.WaitForSelectorAsync($"[data-testid=protocol-summary][data-kind={kind}]", new PageWaitForSelectorOptions { Timeout = 120_000 });
        await page.WaitForSelectorAsync($"[data-testid={plot}] .main-svg .scatterlayer path",
            new PageWaitForSelectorOptions { Timeout = 20_000, State = WaitForSelectorState.Attached });
        Assert.Contains("Research use only", await area.Locator("[data-testid=protocol-caution]").InnerTextAsync());

        var download = await page.RunAndWaitForDownloadAsync(() => page.Locator("[data-testid=protocol-csv]").ClickAsync());
        var lines = (await File.ReadAllTextAsync((await download.PathAsync())!)).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.StartsWith("# Research tool.", lines[0]);
        Assert.StartsWith(header, lines.First(l => !l.StartsWith('#')));
        Assert.True(lines.Count(l => !l.StartsWith('#')) > 5);

        await page.WaitForTimeoutAsync(500);
        await area.ScreenshotAsync(new LocatorScreenshotOptions { Path = Path.Combine(app.ScreenshotDir, $"workbench-protocol-{kind}.png") });
        Assert.True(errors.Count == 0, string.Join("\n", errors));
        await context.CloseAsync();
    }
}
