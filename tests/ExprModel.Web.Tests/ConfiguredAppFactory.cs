using Microsoft.AspNetCore.Hosting;
using Microsoft.AspNetCore.Hosting.Server;
using Microsoft.AspNetCore.Hosting.Server.Features;
using Microsoft.AspNetCore.Mvc.Testing;
using Microsoft.Extensions.DependencyInjection;

namespace ExprModel.Web.Tests;

/// <summary>
/// The app with its own databases in a temp folder and the given settings (section "ExprModel" unless a key has a ':');
/// with <paramref name="kestrel"/>, on a real Kestrel server on a loopback port (<see cref="Address"/>) instead of the
/// in-memory test server.
/// </summary>
public class ConfiguredAppFactory : WebApplicationFactory<Program>
{
    private readonly IReadOnlyDictionary<string, string> settings;
    private readonly bool kestrel;
    private readonly string environment;

    public ConfiguredAppFactory(IReadOnlyDictionary<string, string> settings, bool kestrel = false, string environment = "Development")
    {
        (this.settings, this.kestrel, this.environment) = (settings, kestrel, environment);
        if (kestrel) UseKestrel(0);
    }

    public string Dir { get; } = Path.Combine(Path.GetTempPath(), "exprmodel-web-" + Guid.NewGuid().ToString("N"));

    /// <summary>The Kestrel server's address (after <see cref="WebApplicationFactory{T}.StartServer"/>).</summary>
    public Uri Address => new(Services.GetRequiredService<IServer>().Features.Get<IServerAddressesFeature>()!.Addresses.First());

    protected override void ConfigureWebHost(IWebHostBuilder builder)
    {
        builder.UseSetting("ExprModel:AppDatabasePath", Path.Combine(Dir, "snapshots.db"));
        builder.UseSetting("ExprModel:CatalogDatabasePath", Path.Combine(Dir, "catalog.db"));
        foreach (var (key, value) in settings) builder.UseSetting(key.Contains(':') ? key : "ExprModel:" + key, value);
        builder.UseEnvironment(environment);
        if (kestrel) builder.UseSetting("urls", "http://127.0.0.1:0");
    }

    protected override void Dispose(bool disposing)
    {
        base.Dispose(disposing);
        try { Directory.Delete(Dir, recursive: true); } catch (IOException) { }
    }
}
