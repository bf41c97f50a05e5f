using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Playwright;

namespace ExprModel.EndToEnd.Tests;

/// <summary>
/// Starts the real app on Kestrel on a free loopback port (fresh snapshot database in a temp folder) and Debian's
/// Chromium through Playwright. Playwright's own browser download is not used: the executable is /usr/bin/chromium
/// (override with EXPRMODEL_CHROMIUM).
/// </summary>
public sealed class AppFixture : IAsyncLifetime
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-e2e-" + Guid.NewGuid().ToString("N"));
    private WebApplicationFactory<Program>? _factory;
    private IPlaywright? _playwright;

    public string BaseUrl { get; private set; } = "";
    public IBrowser Browser { get; private set; } = null!;
    public string ScreenshotDir { get; } = Path.Combine(FindRepoRoot(), "TestResults", "screenshots");
    public string WorkDir => _dir;

    public static string ChromiumPath => Environment.GetEnvironmentVariable("EXPRMODEL_CHROMIUM") is { Length: > 0 } p ? p : "/usr/bin/chromium";

    public async Task InitializeAsync()
    {
        Directory.CreateDirectory(_dir);
        Directory.CreateDirectory(ScreenshotDir);
        _factory = new WebApplicationFactory<Program>().WithWebHostBuilder(b =>
        {
            b.UseSetting("urls", "http://127.0.0.1:0");
            b.UseSetting("ExprModel:AppDatabasePath", Path.Combine(_dir, "snapshots.db"));
            b.UseSetting("ExprModel:CatalogDatabasePath", Path.Combine(_dir, "catalog.db"));
            b.UseSetting("ExprModel:MaxUploadMegabytes", "1");
            b.UseEnvironment("Development");
        });
        _factory.UseKestrel(0);
        _factory.StartServer();
        var addresses = _factory.Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses;
        BaseUrl = addresses.First(a => a.StartsWith("http://127.0.0.1", StringComparison.Ordinal)).TrimEnd('/');

        if (!File.Exists(ChromiumPath))
            throw new InvalidOperationException($"{ChromiumPath} not found: install it with 'apt-get install -y chromium' (or set EXPRMODEL_CHROMIUM).");
        _playwright = await Playwright.CreateAsync();
        Browser = await _playwright.Chromium.LaunchAsync(new BrowserTypeLaunchOptions
        {
            ExecutablePath = ChromiumPath,
            Headless = true,
            Args = ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
        });
    }

    /// <summary>A fresh browser context (no cookies, no storage) and page, with console errors collected.</summary>
    public async Task<(IBrowserContext Context, IPage Page, List<string> ConsoleErrors)> NewPageAsync()
    {
        var context = await Browser.NewContextAsync(new BrowserNewContextOptions
        {
            ViewportSize = new ViewportSize { Width = 1500, Height = 1000 },
            AcceptDownloads = true
        });
        var page = await context.NewPageAsync();
        var errors = new List<string>();
        page.Console += (_, m) => { if (m.Type == "error") errors.Add(m.Text); };
        page.PageError += (_, e) => errors.Add(e);
        page.SetDefaultTimeout(30_000);
        return (context, page, errors);
    }

    /// <summary>Opens a page of the app and waits until Blazor's interactive circuit is up.</summary>
    public async Task GotoAsync(IPage page, string path)
    {
        await page.GotoAsync(BaseUrl + path);
        await WaitUntilLiveAsync(page);
    }

    /// <summary>
    /// Waits until the page's interactive circuit has rendered (the layout's data-live="true"): before that the page is
    /// only prerendered and a click on one of its buttons would be lost.
    /// </summary>
    public static Task WaitUntilLiveAsync(IPage page) => page.WaitForSelectorAsync(".frame[data-live=true]");

    public Task ScreenshotAsync(IPage page, string name) =>
        page.ScreenshotAsync(new PageScreenshotOptions { Path = Path.Combine(ScreenshotDir, name + ".png"), FullPage = true });

    public async Task DisposeAsync()
    {
        if (Browser is not null) await Browser.CloseAsync();
        _playwright?.Dispose();
        _factory?.Dispose();
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    private static string FindRepoRoot()
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
            if (File.Exists(Path.Combine(d.FullName, "ExprModel.sln"))) return d.FullName;
        return Directory.GetCurrentDirectory();
    }
}

[CollectionDefinition("app")]
public sealed class AppCollection : ICollectionFixture<AppFixture>;
