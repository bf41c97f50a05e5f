using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;

namespace ExprModel.Core.Tests.Mapping;

/// <summary>The density rule of DOMAIN.md ("Expression to conductance") applied to a small hand-made table.</summary>
public class ExpressionModelBuilderTests
{
    private static MappingCatalog Catalog()
    {
        var c = TestCatalog.Catalog;
        var entries = new[] { c.Resolve("traub-na", null), c.Resolve("traub-kdr", null), c.Resolve("kv7-m-yamada", null), c.Resolve("leak", null) };
        var links = new[]
        {
            new GeneLink(Species.Mouse, "Scn1a", "traub-na", 1, "pore"),
            new GeneLink(Species.Mouse, "Scn8a", "traub-na", 1, "pore"),
            new GeneLink(Species.Mouse, "Kcnb1", "traub-kdr", 1, "pore"),
            new GeneLink(Species.Mouse, "Kcnq2", "kv7-m-yamada", 0.5, "pore"),
            new GeneLink(Species.Mouse, "Kcnq3", "kv7-m-yamada", 0.5, "pore"),
        };
        var statuses = new[] { new GeneStatus(Species.Mouse, "Scn1b", "auxiliary", "beta subunit; modulates gating, no pore") };
        var ids = new[] { new GeneIdentifier("ENSMUSG00000064329", "ensembl", "Scn1a", Species.Mouse) };
        return new MappingCatalog(entries, links, statuses, ids);
    }

    private static ExpressionTable Table() => new()
    {
        Source = "pilot.csv",
        CellIds = ["c1", "c2", "c3", "c4"],
        // CPM values: median of Na (Scn1a + Scn8a) over cells is 100.
        Genes = new Dictionary<string, double[]>
        {
            ["ENSMUSG00000064329.3"] = [50, 50, 100, 150],
            ["Scn8a"] = [50, 50, 0, 0],
            ["Kcnb1"] = [10, 10, 40, 40],
            ["Kcnq2"] = [0, 0, 0, 200],
            ["Kcnq3"] = [0, 0, 0, 0],
            ["Scn1b"] = [5, 5, 5, 5],
            ["Actb"] = [1000, 1000, 1000, 1000],
        },
        LibrarySizes = [1e6, 1e6, 1e6, 1e6],
        TotalGeneCount = 7,
        Unit = ExpressionUnit.Cpm,
        UnitNote = "given",
        Orientation = TableOrientation.GenesAsRows,
        OrientationNote = "given",
    };

    [Fact]
    public void DensityFollowsExpressionRelativeToTheDatasetMedian()
    {
        var cat = Catalog();
        var report = ExpressionMapping.Map(Table(), cat);
        Assert.Contains(report.Genes, g => g.Symbol == "Scn1a" && g.How.StartsWith("Ensembl id"));
        Assert.Contains(report.Unmapped, u => u.Symbol == "Scn1b" && u.Status == "auxiliary");
        var groups =
            new CellGroups(["c1", "c2", "c3", "c4"], new Dictionary<string, string> { ["c1"] = "A", ["c2"] = "A", ["c3"] = "B", ["c4"] = "B" }, "type");
        var built = ExpressionModelBuilder.Build(Table(), report, cat, new DensityRule(), ModelTarget.ForGroup("B"), groups);
        var na = built.Densities.Single(d => d.EntryId == "traub-na");
        // Na per cell = 100, 100, 100, 150; median 100; group B mean 125 -> ratio 1.25 x typical.
        Assert.Equal(100, na.Reference, 9);
        Assert.Equal(1.25, na.Ratio, 9);
        Assert.Equal(1.25 * na.TypicalMsPerCm2, na.DensityMsPerCm2, 9);
        // Kv7: 0.5 * Kcnq2; per cell 0,0,0,100; median 0 so the mean (25) is the reference; group B mean 50 -> ratio 2.
        var m = built.Densities.Single(d => d.EntryId == "kv7-m-yamada");
        Assert.Equal(25, m.Reference, 9);
        Assert.Equal(2, m.Ratio, 9);
        Assert.NotNull(built.Document.Derivation);
        Assert.Contains(built.Document.Channels, c => c.Entry == "leak");
    }

    [Fact]
    public void ProxyLinksFeedTheirEntryAndAreReportedWithTheirReason()
    {
        var c = Catalog();
        var links = c.Links.Select(l => l.Symbol == "Kcnq2" ? l with { Role = GeneLink.ProxyRole, Reason = "stand-in for a test" } : l).ToArray();
        var cat = c with { Links = links };
        var report = ExpressionMapping.Map(Table(), cat);
        var kcnq2 = report.Genes.Single(g => g.Symbol == "Kcnq2").Entries.Single();
        Assert.True(kcnq2.IsProxy);
        Assert.Equal("stand-in for a test", kcnq2.ProxyReason);
        Assert.False(report.Genes.Single(g => g.Symbol == "Kcnq3").Entries.Single().IsProxy);
        Assert.Equal([new ProxyLink("Kcnq2", "kv7-m-yamada", "stand-in for a test")], report.Proxies);
        // A proxy still feeds its entry: 0.5 x Kcnq2 per cell, as without the mark.
        Assert.Equal([0, 0, 0, 100], report.EntryExpression()["kv7-m-yamada"]);
        // Excluded by the user, it is no longer a proxy in use.
        Assert.Empty(ExpressionMapping.Map(Table(), cat, [new GeneOverride("Kcnq2", Exclude: true)]).Proxies);
    }

    [Fact]
    public void ExponentReferenceGroupClampAndOverrides()
    {
        var cat = Catalog();
        var groups =
            new CellGroups(["c1", "c2", "c3", "c4"], new Dictionary<string, string> { ["c1"] = "A", ["c2"] = "A", ["c3"] = "B", ["c4"] = "B" }, "type");
        var report = ExpressionMapping.Map(Table(), cat, [new GeneOverride("Scn8a", Exclude: true), new GeneOverride("Kcnb1", Weight: 2)]);
        var rule = new DensityRule { Reference = DensityReference.ReferenceGroup, ReferenceGroup = "A", Exponent = 0.5 };
        var built = ExpressionModelBuilder.Build(Table(), report, cat, rule, ModelTarget.ForGroup("B"), groups);
        var na = built.Densities.Single(d => d.EntryId == "traub-na");
        // Without Scn8a: A mean 50, B mean 125 -> ratio 2.5, exponent 0.5.
        Assert.Equal(2.5, na.Ratio, 9);
        Assert.Equal(Math.Sqrt(2.5) * na.TypicalMsPerCm2, na.RawMsPerCm2, 9);
        // Kv7 in A is 0: reference 0 gives ratio 0 and no channel.
        Assert.DoesNotContain(built.Document.Channels, c => c.Entry == "kv7-m-yamada");
        var clampRule = new DensityRule { Exponent = 4 };
        var clamped = ExpressionModelBuilder.Build(Table(), ExpressionMapping.Map(Table(), cat), cat, clampRule, ModelTarget.ForCell("c4"), groups);
        var kv7 = clamped.Densities.Single(d => d.EntryId == "kv7-m-yamada");
        Assert.True(kv7.Clamped);
        Assert.Contains(clamped.Warnings, w => w.Contains("kv7-m-yamada") && w.Contains("clamped"));
        var bad = ExpressionMapping.Map(Table(), cat, [new GeneOverride("Kcnb1", EntryId: "no-such-entry")]);
        Assert.Contains(bad.Problems, p => p.Contains("no-such-entry"));
    }
}
