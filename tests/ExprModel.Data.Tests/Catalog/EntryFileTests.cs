using ExprModel.Data.Catalog;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>Unreadable catalog JSON is named by file, line, position and path, in the library's one wording.</summary>
public class EntryFileTests
{
    [Fact]
    public void ABrokenEntryNamesFileLineAndPath()
    {
        var e = Assert.Throws<CatalogException>(() => EntryFile.Parse("{\n  \"id\": \"x\",\n  \"version\": \"one\"\n}", "catalog/entries/x.v1.json"));
        Assert.StartsWith("catalog/entries/x.v1.json: line 3, position ", e.Message);
        Assert.Contains("at $.version: ", e.Message);
    }

    [Fact]
    public void ABrokenProvenanceFileIsACatalogProblemNamingIt()
    {
        var sources = new CatalogSources(new Dictionary<string, string> { ["genes/identifiers.provenance.json"] = "{\"source\": " }, "test");
        var e = Assert.Throws<CatalogException>(() => CatalogContent.Parse(sources));
        Assert.StartsWith("catalog/genes/identifiers.provenance.json: line 1, position ", e.Message);
    }
}
