using ExprModel.Data.Catalog;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>The checkout's catalog/ directory and its parsed content, shared by the catalog tests.</summary>
public static class CatalogFiles
{
    private static readonly Lazy<string> Dir = new(() =>
        CatalogLocator.FindSourceDirectory() ?? throw new InvalidOperationException("catalog/ not found above the test directory"));
    private static readonly Lazy<CatalogContent> Parsed = new(() => CatalogContent.Parse(CatalogSources.FromDirectory(Directory)));

    public static string Directory => Dir.Value;
    public static CatalogContent Content => Parsed.Value;
    public static CatalogSources Sources() => CatalogSources.FromDirectory(Directory);

    /// <summary>Entry file names (entries/ID.vN.json) relative to catalog/.</summary>
    public static IEnumerable<string> EntryFileNames() =>
        System.IO.Directory.EnumerateFiles(Path.Combine(Directory, "entries"), "*.json").Select(p => "entries/" + Path.GetFileName(p))
            .Order(StringComparer.Ordinal);

    public static TheoryData<string> EntryKeys()
    {
        var data = new TheoryData<string>();
        foreach (var e in Content.Entries) data.Add(e.Key);
        return data;
    }
}
