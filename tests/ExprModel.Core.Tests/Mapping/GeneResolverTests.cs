using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Mapping;

namespace ExprModel.Core.Tests.Mapping;

/// <summary>Identifier resolution against a hand-made catalog (Scn1a's Ensembl id ENSMUSG00000064329, from Ensembl).</summary>
public class GeneResolverTests
{
    private static GeneResolver Resolver() => new(
        [new GeneLink(Species.Mouse, "Scn1a", "traub-na", 1, "pore"), new GeneLink(Species.Mouse, "Kcnb1", "traub-kdr", 1, "pore")],
        [],
        [
            new GeneIdentifier("ENSMUSG00000064329", "ensembl", "Scn1a", Species.Mouse),
            new GeneIdentifier("Kv2", "alias", "Kcnb1", Species.Mouse),
            new GeneIdentifier("Kv2", "alias", "Scn1a", Species.Mouse),
        ]);

    [Fact]
    public void EachIdentifierIsResolvedOnceAndRemembered()
    {
        var r = Resolver();
        var first = r.Resolve("ENSMUSG00000064329.3", out var p1);
        Assert.NotNull(first);
        Assert.Equal(("Scn1a", "Ensembl id (version suffix ignored)"), (first.Symbol, first.How));
        Assert.Null(p1);
        // The reader's gene filter and the mapping ask for the same identifier: the second answer is the first one.
        Assert.Same(first, r.Resolve("ENSMUSG00000064329.3", out _));
    }

    [Fact]
    public void AnAmbiguousAliasIsReportedEveryTimeItIsAsked()
    {
        var r = Resolver();
        Assert.Null(r.Resolve("Kv2", out var p1));
        Assert.Contains("ambiguous", p1);
        Assert.Null(r.Resolve("Kv2", out var p2));
        Assert.Equal(p1, p2);
        Assert.False(r.Knows("Kv2"));
        Assert.False(r.Knows("Actb"));
        Assert.True(r.Knows("SCN1A"));
    }
}
