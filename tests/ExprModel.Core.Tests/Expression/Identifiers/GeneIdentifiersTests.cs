using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Tests.Expression.Identifiers;

public sealed class GeneIdentifiersTests
{
    // Ensembl stable gene ids: "ENS" + species prefix (none for human, MUS mouse, RNO rat) + "G" + 11 digits, with
    // an optional ".version" (Ensembl documentation, "Stable IDs"; from memory). The ids below are written in that
    // form; they are used as shapes, not looked up.
    [Theory]
    [InlineData("ENSG00000144285", Species.Human, null)]
    [InlineData("ENSMUSG00000064329.7", Species.Mouse, 7)]
    [InlineData("ENSRNOG00000004439.3", Species.Rat, 3)]
    public void ParsesEnsemblGeneIds(string id, Species species, int? version)
    {
        var p = GeneIdentifiers.Parse(id);
        Assert.Equal(IdentifierKind.EnsemblGene, p.Kind);
        Assert.Equal(species, p.Species);
        Assert.Equal(version, p.EnsemblVersion);
        Assert.Equal(id.Split('.')[0], p.Key);
    }

    [Theory]
    [InlineData("ENSMUSG00000064329.12", "ENSMUSG00000064329")]
    [InlineData("ENSG00000144285", "ENSG00000144285")]
    [InlineData("Scn1a.2", "Scn1a.2")] // not an Ensembl id: left alone
    public void StripsOnlyEnsemblVersions(string id, string stripped) =>
        Assert.Equal(stripped, GeneIdentifiers.StripEnsemblVersion(id));

    // Case conventions: HGNC human symbols are upper case (HGNC guidelines, Bruford et al. 2020, Nat Genet 52:754);
    // mouse (MGI) and rat (RGD) symbols start with a capital followed by lower case (from memory). DOMAIN.md lists
    // the same examples (SCN1A / Scn1a).
    [Theory]
    [InlineData("SCN1A", SymbolCase.HumanUpper)]
    [InlineData("KCNMA1", SymbolCase.HumanUpper)]
    [InlineData("Scn1a", SymbolCase.RodentCapitalised)]
    [InlineData("Cacna1g", SymbolCase.RodentCapitalised)]
    [InlineData("scn1a", SymbolCase.Other)]
    public void SymbolCaseConventions(string symbol, SymbolCase expected) =>
        Assert.Equal(expected, GeneIdentifiers.CaseOf(symbol));

    [Theory]
    [InlineData("SCN1A", Species.Mouse, "Scn1a")]
    [InlineData("Kcnc1", Species.Human, "KCNC1")]
    [InlineData("CACNA1G", Species.Rat, "Cacna1g")]
    public void ConvertsToSpeciesCase(string symbol, Species species, string expected) =>
        Assert.Equal(expected, GeneIdentifiers.ToSpeciesCase(symbol, species));

    [Fact]
    public void ReportsDuplicatesCaseCollisionsAndEnsemblVersions()
    {
        var issues = GeneIdentifiers.FindIssues(["Scn1a", "SCN1A", "Gapdh", "Gapdh", "ENSMUSG00000064329.1", "ENSMUSG00000064329.2", "Kcnc1"]);
        Assert.Contains(issues, i => i.Kind == "duplicate" && i.Identifiers.SequenceEqual(["Gapdh"]));
        Assert.Contains(issues, i => i.Kind == "case-collision" && i.Identifiers.SequenceEqual(["SCN1A", "Scn1a"]));
        Assert.Contains(issues, i => i.Kind == "ensembl-versions" && i.Identifiers.Count == 2);
        Assert.DoesNotContain(issues, i => i.Identifiers.Contains("Kcnc1"));
    }

    [Fact]
    public void BarcodesAreNotSymbols()
    {
        Assert.Equal(IdentifierKind.Other, GeneIdentifiers.Parse("AAACCTGAGAAGGCCT-1").Kind);
        Assert.Equal(IdentifierKind.Symbol, GeneIdentifiers.Parse("1700012B09Rik").Kind);
        Assert.Equal(IdentifierKind.Symbol, GeneIdentifiers.Parse("mt-Co1").Kind);
    }
}
