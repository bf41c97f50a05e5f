using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Tests.Stochastic;

public class UnitaryConductancesTests
{
    [Fact]
    public void Own_row_before_family_default_before_last_resort()
    {
        var table = new UnitaryConductances(
        [
            new UnitaryConductance("squid-k-hh1952", 20, false, "c", ""),
            new UnitaryConductance("family:historical", 18, true, "c", ""),
            new UnitaryConductance(UnitaryConductances.LastResortKey, 10, true, "c", ""),
        ]);
        var k = TestCatalog.Catalog.Resolve("squid-k-hh1952", null);
        Assert.Equal(20, table.For(k).ConductancePs);
        Assert.Equal(18, table.For(TestCatalog.Catalog.Resolve("squid-na-hh1952", null)).ConductancePs);
        Assert.Equal(10, table.For(k with { Id = "other", Family = "Kv3" }).ConductancePs);
        Assert.Throws<ArgumentException>(() => new UnitaryConductances([new UnitaryConductance("x", 1, false, "c", "")]));
    }
}
