using ExprModel.Data.Catalog;
using ExprModel.Data.Store;
using ExprModel.Web.Apis;
using ExprModel.Web.Components;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.Extensions.Options;

var builder = WebApplication.CreateBuilder(new WebApplicationOptions { Args = args, WebRootPath = WebRoot.Locate() });

builder.Services.Configure<WebOptions>(builder.Configuration.GetSection(WebOptions.Section));
var options = builder.Configuration.GetSection(WebOptions.Section).Get<WebOptions>() ?? new WebOptions();
if (options.Problem() is { } settingProblem) throw new InvalidOperationException("ExprModel cannot start: " + settingProblem);
ServerLogging.Configure(builder, options);
if (string.IsNullOrEmpty(builder.Configuration["urls"]) && string.IsNullOrEmpty(builder.Configuration["ASPNETCORE_URLS"]))
    builder.WebHost.UseUrls("http://127.0.0.1:5080");
builder.WebHost.ConfigureKestrel(k => k.Limits.MaxRequestBodySize = options.MaxUploadBytes + 1024 * 1024);

builder.Services.AddSingleton(sp =>
{
    var o = sp.GetRequiredService<IOptions<WebOptions>>().Value;
    return o.CatalogDatabasePath is { Length: > 0 } path ? CatalogLocator.Ensure(path) : CatalogLocator.Default();
});
builder.Services.AddSingleton(sp =>
    SnapshotStore.Open(sp.GetRequiredService<IOptions<WebOptions>>().Value.AppDatabasePath is { Length: > 0 } p ? p : SnapshotStore.DefaultPath()));
builder.Services.AddSingleton<SimulationGate>();
builder.Services.AddSingleton<BuildQueue>();
builder.Services.AddSingleton<ModelRunner>();
builder.Services.AddSingleton(sp => new SnapshotService(sp.GetRequiredService<SnapshotStore>(), sp.GetRequiredService<ModelRunner>(),
    sp.GetRequiredService<IOptions<WebOptions>>().Value.MaxSnapshotBytes));
builder.Services.AddSingleton<DemoData>();
builder.Services.AddScoped<WorkspaceState>();

builder.Services.AddProblemDetails();
builder.Services.AddExceptionHandler<ProblemMapping>();
builder.Services.Configure<RouteHandlerOptions>(o => o.ThrowOnBadRequest = true);
builder.Services.ConfigureHttpJsonOptions(o =>
{
    o.SerializerOptions.NumberHandling = System.Text.Json.Serialization.JsonNumberHandling.AllowNamedFloatingPointLiterals;
    // A misspelt field (exponnet, stepp) is refused by name, as the model file refuses one, rather than silently ignored.
    o.SerializerOptions.UnmappedMemberHandling = System.Text.Json.Serialization.JsonUnmappedMemberHandling.Disallow;
});
builder.Services.AddExprModelRateLimits(options);
builder.Services.AddOpenApi("v1");
builder.Services.AddAntiforgery();
builder.Services.AddRazorComponents()
    .AddInteractiveServerComponents(o => o.DisconnectedCircuitRetentionPeriod = TimeSpan.FromMinutes(10));

var app = builder.Build();

// Build the catalog database and open the snapshot database now, so the first page is fast and errors show at start:
// a snapshot database that is junk, damaged, read-only or unwritable refuses to start (exit 1) naming the file and the reason.
ChannelCatalog catalog;
SnapshotStore store;
try
{
    catalog = app.Services.GetRequiredService<ChannelCatalog>();
    store = app.Services.GetRequiredService<SnapshotStore>();
}
catch (Exception e) when (e is SnapshotStoreException or CatalogException)
{
    Console.Error.WriteLine($"ExprModel cannot start: {e.Message}");
    return 1;
}

app.UseExceptionHandler();
app.UseStatusCodePages();
app.UseSecurityHeaders();
app.UseRequestBodyLimits();
app.UseRateLimiter();
app.UseStaticFiles();
app.UseAntiforgery();

app.MapOpenApi("/openapi/{documentName}.json");
app.MapCatalogApi();
app.MapSimulationApi();
app.MapModelsApi();
app.MapBuildApi();
app.MapWhatIfApi();
app.MapCompareApi();
app.MapPaperApi();
app.MapPatchApi();
app.MapStaticAssets();
app.MapRazorComponents<App>().AddInteractiveServerRenderMode();

app.Lifetime.ApplicationStarted.Register(() =>
{
    foreach (var url in app.Urls) Console.WriteLine($"ExprModel is running at {url}  (catalog: {catalog.Latest.Count} entries, {catalog.DatabasePath}; " +
        $"shared models: {store.DatabasePath})");
});

app.Run();
return 0;

/// <summary>Entry point, visible to the test host.</summary>
public partial class Program;
