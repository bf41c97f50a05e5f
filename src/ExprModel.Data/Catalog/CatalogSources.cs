using System.Reflection;
using System.Security.Cryptography;
using System.Text;

namespace ExprModel.Data.Catalog;

/// <summary>
/// The catalog's source files (entries, gene tables, preset models), read either from a catalog/ directory
/// (for curators) or from the copy embedded in this assembly at build time (the default that always works).
/// </summary>
public sealed class CatalogSources
{
    /// <summary>Relative path (forward slashes, e.g. "entries/squid-na.v1.json") to text.</summary>
    public IReadOnlyDictionary<string, string> Files { get; }
    public string Origin { get; }

    public CatalogSources(IReadOnlyDictionary<string, string> files, string origin)
    {
        Files = files;
        Origin = origin;
    }

    public IEnumerable<KeyValuePair<string, string>> Under(string folder) =>
        Files.Where(f => f.Key.StartsWith(folder + "/", StringComparison.Ordinal)).OrderBy(f => f.Key, StringComparer.Ordinal);

    /// <summary>SHA-256 over every file name and content, in ordinal order: the database is stale when it differs.</summary>
    public string ContentHash()
    {
        using var sha = SHA256.Create();
        foreach (var (name, text) in Files.OrderBy(f => f.Key, StringComparer.Ordinal))
        {
            var b = Encoding.UTF8.GetBytes(name + "\n" + text.Replace("\r\n", "\n") + "\n\0");
            sha.TransformBlock(b, 0, b.Length, null, 0);
        }
        sha.TransformFinalBlock([], 0, 0);
        return Convert.ToHexStringLower(sha.Hash!);
    }

    public static CatalogSources FromDirectory(string dir)
    {
        if (!Directory.Exists(Path.Combine(dir, "entries")))
            throw new CatalogException($"{dir}: not a catalog directory (no entries/ folder).");
        var files = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var path in Directory.EnumerateFiles(dir, "*", SearchOption.AllDirectories))
        {
            var rel = Path.GetRelativePath(dir, path).Replace('\\', '/');
            if (!IsSource(rel)) continue;
            files[rel] = File.ReadAllText(path);
        }
        return new CatalogSources(files, Path.GetFullPath(dir));
    }

    public static CatalogSources Embedded()
    {
        var asm = typeof(CatalogSources).Assembly;
        var files = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var name in asm.GetManifestResourceNames())
        {
            if (!name.StartsWith("catalog/", StringComparison.Ordinal)) continue;
            var rel = name["catalog/".Length..];
            if (!IsSource(rel)) continue;
            using var s = asm.GetManifestResourceStream(name)!;
            using var r = new StreamReader(s, Encoding.UTF8);
            files[rel] = r.ReadToEnd();
        }
        if (files.Count == 0) throw new CatalogException("No catalog sources are embedded in ExprModel.Data; rebuild the project.");
        return new CatalogSources(files, "embedded:" + asm.GetName().Version);
    }

    private static bool IsSource(string rel) =>
        (rel.StartsWith("entries/", StringComparison.Ordinal) && rel.EndsWith(".json", StringComparison.Ordinal)) ||
        (rel.StartsWith("models/", StringComparison.Ordinal) && rel.EndsWith(".json", StringComparison.Ordinal)) ||
        (rel.StartsWith("genes/", StringComparison.Ordinal)
            && (rel.EndsWith(".csv", StringComparison.Ordinal) || rel.EndsWith(".json", StringComparison.Ordinal))) ||
        rel == "versions.lock" || rel == "unitary-conductances.csv";
}
