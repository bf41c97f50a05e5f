namespace ExprModel.Web.Hosting;

/// <summary>The app's settings (configuration section "ExprModel"; environment variables ExprModel__Name).</summary>
public sealed class WebOptions
{
    public const string Section = "ExprModel";

    /// <summary>The SQLite file of shared snapshots; default under the user's local application data.</summary>
    public string? AppDatabasePath { get; set; }
    /// <summary>The catalog database; default <see cref="ExprModel.Data.Catalog.CatalogLocator.DefaultDatabasePath"/>.</summary>
    public string? CatalogDatabasePath { get; set; }
    /// <summary>Largest expression table accepted, in megabytes (browser upload and HTTP API alike).</summary>
    public long MaxUploadMegabytes { get; set; } = 200;
    /// <summary>Wall-clock cap on one simulation request; the run is cancelled when it is reached.</summary>
    public double SimulationTimeoutSeconds { get; set; } = 30;
    /// <summary>How many simulations may run at once across all users; more wait their turn.</summary>
    public int MaxConcurrentSimulations { get; set; } = 2;
    /// <summary>Folder holding the demo dataset; default catalog/demo of the checkout.</summary>
    public string? DemoDirectory { get; set; }

    public long MaxUploadBytes => MaxUploadMegabytes * 1024 * 1024;
}
