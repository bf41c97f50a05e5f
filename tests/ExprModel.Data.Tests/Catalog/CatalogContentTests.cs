using ExprModel.Core.Stochastic;
using ExprModel.Data.Catalog;

namespace ExprModel.Data.Tests.Catalog;

public class CatalogContentTests
{
    [Fact]
    public void Every_entry_with_gates_gets_a_labelled_unitary_conductance_and_the_table_survives_the_database()
    {
        var content = CatalogFiles.Content;
        foreach (var e in content.Entries)
        {
            var u = content.UnitaryConductances.For(e);
            Assert.True(u.ConductancePs > 0, e.Key);
            Assert.False(string.IsNullOrWhiteSpace(u.Citation), e.Key);
            Assert.True(u.IsFamilyDefault ? u.Key.StartsWith("family:", StringComparison.Ordinal) : u.Key == e.Id, e.Key);
        }
        var db = Path.Combine(Path.GetTempPath(), $"exprmodel-unitary-{Guid.NewGuid():N}.db");
        try
        {
            CatalogBuilder.Build(CatalogFiles.Sources(), db);
            var loaded = ChannelCatalog.Open(db);
            Assert.Equal(content.UnitaryConductances.Rows.OrderBy(r => r.Key, StringComparer.Ordinal), loaded.UnitaryConductances.Rows);
        }
        finally
        {
            File.Delete(db);
        }
    }

    [Fact]
    public void An_entry_added_later_gets_its_family_default_or_the_last_resort()
    {
        var table = CatalogFiles.Content.UnitaryConductances;
        var nav = CatalogFiles.Content.Entries.First(e => e.Family == "Nav-transient") with { Id = "nav-added-later" };
        Assert.Equal("family:Nav-transient", table.For(nav).Key);
        Assert.Equal(UnitaryConductances.LastResortKey, table.For(nav with { Family = "brand-new-family" }).Key);
        Assert.StartsWith("family default", table.For(nav).BasisLabel, StringComparison.Ordinal);
    }

    [Fact]
    public void A_bad_row_is_refused_with_file_line_and_column()
    {
        var files = CatalogFiles.Sources().Files.ToDictionary(f => f.Key, f => f.Value);
        files["unitary-conductances.csv"] = "key,conductance_ps,basis,citation,note\nfamily:*,10,family-default,x,y\nno-such-entry,5,entry,x,y\n";
        var e = Assert.Throws<CatalogException>(() => CatalogContent.Parse(new CatalogSources(files, "test")));
        Assert.Contains("unitary-conductances.csv: line 3, column key: unknown entry 'no-such-entry'", e.Message);
        files["unitary-conductances.csv"] = "key,conductance_ps,basis,citation,note\nfamily:*,-1,family-default,x,y\n";
        e = Assert.Throws<CatalogException>(() => CatalogContent.Parse(new CatalogSources(files, "test")));
        Assert.Contains("line 2, column conductance_ps", e.Message);
    }
}
