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
    /// <summary>Most bytes a compressed (gzip) table may inflate to, in megabytes.</summary>
    public long MaxDecompressedMegabytes { get; set; } = 1024;
    /// <summary>Most physical lines (blank lines included) a text table or metadata file may have.</summary>
    public long MaxTableLines { get; set; } = 2_000_000;
    /// <summary>How many expression tables may be read and built at once (/api/build, /api/compare).</summary>
    public int MaxConcurrentBuilds { get; set; } = 2;
    /// <summary>How many more build requests may wait for a slot; past that the server answers 503 with Retry-After.</summary>
    public int MaxQueuedBuilds { get; set; } = 8;
    /// <summary>Largest JSON body of the routes that carry a model (simulate, fi, readouts, what-if), in kilobytes.</summary>
    public long MaxModelRequestKilobytes { get; set; } = 256;
    /// <summary>Largest shared model (POST /api/models body, and a stored snapshot with its optional expression table), in megabytes.</summary>
    public long MaxSnapshotMegabytes { get; set; } = 16;
    /// <summary>Longest text field of a request or model file (names, notes, description...), in characters.</summary>
    public int MaxTextFieldChars { get; set; } = 20_000;
    /// <summary>Wall-clock cap on one simulation request; the run is cancelled when it is reached.</summary>
    public double SimulationTimeoutSeconds { get; set; } = 30;
    /// <summary>How many simulations may run at once across all users; more wait their turn.</summary>
    public int MaxConcurrentSimulations { get; set; } = 2;
    /// <summary>Requests per minute one client (remote address) may make to the expensive API routes; 0 turns the limit off.</summary>
    public int RateLimitPerMinute { get; set; } = 120;
    /// <summary>How many of those requests a client may make in a burst.</summary>
    public int RateLimitBurst { get; set; } = 30;
    /// <summary>
    /// The address share links start with (e.g. https://models.example.org); when empty, the request's own scheme and Host
    /// header. Set it behind a proxy or wherever the Host header is not the public address.
    /// </summary>
    public string? PublicBaseUrl { get; set; }
    /// <summary>"simple" (default) or "json": one JSON object per log entry on the console.</summary>
    public string LogFormat { get; set; } = "simple";
    /// <summary>Folder holding the demo dataset; default catalog/demo of the checkout.</summary>
    public string? DemoDirectory { get; set; }

    public long MaxUploadBytes => MaxUploadMegabytes * 1024 * 1024;
    public long MaxModelRequestBytes => MaxModelRequestKilobytes * 1024;
    public long MaxSnapshotBytes => MaxSnapshotMegabytes * 1024 * 1024;

    /// <summary>The limits every expression upload is read under.</summary>
    public UploadLimits UploadLimits => new(MaxDecompressedMegabytes * 1024 * 1024, MaxTableLines);

    /// <summary>A problem naming the setting when one cannot be used, else null (checked at start-up).</summary>
    public string? Problem()
    {
        if (PublicBaseUrl is { Length: > 0 } url
            && (!Uri.TryCreate(url, UriKind.Absolute, out var u) || u.Scheme is not ("http" or "https") || u.Query.Length > 0 || u.Fragment.Length > 0))
            return $"{Section}:PublicBaseUrl: '{url}' is not an absolute http or https address without query (e.g. https://models.example.org).";
        if (LogFormat is not ("simple" or "json")) return $"{Section}:LogFormat: '{LogFormat}' is not simple or json.";
        if (MaxConcurrentBuilds < 1) return $"{Section}:MaxConcurrentBuilds: must be at least 1 (got {MaxConcurrentBuilds}).";
        if (MaxQueuedBuilds < 0) return $"{Section}:MaxQueuedBuilds: must be 0 or more (got {MaxQueuedBuilds}).";
        if (MaxModelRequestKilobytes < 1 || MaxSnapshotMegabytes < 1 || MaxTextFieldChars < 1 || MaxDecompressedMegabytes < 1 || MaxTableLines < 1)
            return $"{Section}: MaxModelRequestKilobytes, MaxSnapshotMegabytes, MaxTextFieldChars, MaxDecompressedMegabytes and MaxTableLines "
                + "must be positive.";
        if (RateLimitPerMinute < 0 || RateLimitBurst < 1) return $"{Section}:RateLimitPerMinute must be 0 or more and RateLimitBurst at least 1.";
        return null;
    }
}
