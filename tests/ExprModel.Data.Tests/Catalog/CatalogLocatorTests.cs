using ExprModel.Data.Catalog;
using ExprModel.Data.Tests.Store;

namespace ExprModel.Data.Tests.Catalog;

public sealed class CatalogLocatorTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "exprmodel-locator-" + Guid.NewGuid().ToString("N"));

    [Fact]
    public void A_catalog_database_with_damaged_pages_under_an_intact_meta_table_is_rebuilt_from_its_sources()
    {
        var path = Path.Combine(_dir, "catalog.db");
        var sources = CatalogFiles.Sources();
        var fresh = CatalogLocator.Ensure(path, sources);
        StoreFiles.DamagePages(path, "gate_rates");
        Assert.False(CatalogLocator.IsCurrent(path, sources)); // meta still names the right hash; quick_check finds the damage
        var rebuilt = CatalogLocator.Ensure(path, sources);
        Assert.Equal(fresh.Latest.Count, rebuilt.Latest.Count);
        Assert.True(CatalogLocator.IsCurrent(path, sources));
    }

    [Fact]
    public void An_unreadable_catalog_database_error_names_the_file()
    {
        Directory.CreateDirectory(_dir);
        var path = Path.Combine(_dir, "junk.db");
        File.WriteAllText(path, "not a database at all, but long enough to look like a file header of something else\n");
        var e = Assert.Throws<CatalogException>(() => ChannelCatalog.Open(path));
        Assert.Contains(path, e.Message);
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
