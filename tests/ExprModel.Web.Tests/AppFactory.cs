using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Mvc.Testing;

namespace ExprModel.Web.Tests;

/// <summary>The app in memory with its own catalog and snapshot databases in a temp folder and a 1 MB upload limit.</summary>
public sealed class AppFactory : WebApplicationFactory<Program>
{
    public string Dir { get; } = Path.Combine(Path.GetTempPath(), "exprmodel-web-" + Guid.NewGuid().ToString("N"));

    protected override void ConfigureWebHost(IWebHostBuilder builder)
    {
        builder.UseSetting("ExprModel:AppDatabasePath", Path.Combine(Dir, "snapshots.db"));
        builder.UseSetting("ExprModel:CatalogDatabasePath", Path.Combine(Dir, "catalog.db"));
        builder.UseSetting("ExprModel:MaxUploadMegabytes", "1");
        // One test client makes hundreds of API calls; the per-client rate limit has its own tests (Hosting/RateLimitsTests).
        builder.UseSetting("ExprModel:RateLimitPerMinute", "0");
        builder.UseEnvironment("Development");
    }

    protected override void Dispose(bool disposing)
    {
        base.Dispose(disposing);
        try { Directory.Delete(Dir, recursive: true); } catch (IOException) { }
    }
}
