using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Workspace;

/// <summary>The shipped demo dataset (catalog/demo/ of the checkout, or the configured folder): an expression table and its metadata.</summary>
public sealed class DemoData(IOptions<WebOptions> options)
{
    public string? Directory
    {
        get
        {
            if (options.Value.DemoDirectory is { Length: > 0 } d) return System.IO.Directory.Exists(d) ? d : null;
            var src = CatalogLocator.FindSourceDirectory();
            if (src is null) return null;
            var demo = Path.Combine(src, "demo");
            return System.IO.Directory.Exists(demo) ? demo : null;
        }
    }

    /// <summary>The demo expression table, if shipped: the first file whose name says expression or counts.</summary>
    public string? ExpressionFile => Files().FirstOrDefault(f => Name(f).Contains("expression") || Name(f).Contains("counts"));

    /// <summary>The demo metadata table, if shipped.</summary>
    public string? MetadataFile => Files().FirstOrDefault(f => Name(f).Contains("metadata") || Name(f).Contains("cells"));

    public bool Available => ExpressionFile is not null;

    /// <summary>The demo's recorded sweeps (one NWB file per recorded cell), if shipped.</summary>
    public string? RecordingsDirectory =>
        Directory is { } d && System.IO.Directory.Exists(Path.Combine(d, "recordings")) ? Path.Combine(d, "recordings") : null;

    private IEnumerable<string> Files() => Directory is { } d
        ? System.IO.Directory.EnumerateFiles(d).Where(f => f.EndsWith(".csv", StringComparison.OrdinalIgnoreCase)
            || f.EndsWith(".tsv", StringComparison.OrdinalIgnoreCase)
            || f.EndsWith(".csv.gz", StringComparison.OrdinalIgnoreCase)
            || f.EndsWith(".tsv.gz", StringComparison.OrdinalIgnoreCase)).Order(StringComparer.Ordinal)
        : [];

    private static string Name(string f) => Path.GetFileName(f).ToLowerInvariant();
}
