using System.Text.Json.Nodes;
using ExprModel.Core.Perturbation;

namespace ExprModel.Core.Tests.Perturbation;

/// <summary>Gene knock-downs recompute densities with the rule of DOMAIN.md ("Expression to conductance"), checked by hand.</summary>
public class GeneKnockdownsTests
{
    // traub-na fed by Scn1a (weight 1, 60 CPM) and Scn8a (weight 0.5, 80 CPM): expression 100, reference 50, exponent 1.5.
    private static ExprModel.Core.Models.ModelDocument Doc(double exponent = 1.5, bool clamp = false) => TestCatalog.Catalog.Preset("cortex-rs2008") with
    {
        Derivation = new JsonObject
        {
            ["exponent"] = exponent,
            ["clamp"] = clamp,
            ["densities"] = new JsonArray(
                new JsonObject
                {
                    ["entry"] = "traub-na",
                    ["expression"] = 100.0,
                    ["reference"] = 50.0,
                    ["typicalMsPerCm2"] = 50 / Math.Pow(2, exponent),
                    ["densityMsPerCm2"] = 50.0,
                    ["genes"] = new JsonArray(new JsonObject { ["gene"] = "Scn1a", ["weight"] = 1.0, ["expression"] = 60.0 },
                        new JsonObject { ["gene"] = "Scn8a", ["weight"] = 0.5, ["expression"] = 80.0 }),
                },
                new JsonObject
                {
                    ["entry"] = "kv7-m-yamada",
                    ["expression"] = 40.0,
                    ["reference"] = 40.0,
                    ["typicalMsPerCm2"] = 0.07,
                    ["densityMsPerCm2"] = 0.07,
                    ["genes"] = new JsonArray(new JsonObject { ["gene"] = "Scn8a", ["weight"] = 0.25, ["expression"] = 80.0 }),
                }),
        },
    };

    [Fact]
    public void Half_a_gene_lowers_each_entry_it_feeds_by_the_rule()
    {
        var doc = Doc();
        var targets = GeneKnockdowns.Targets(doc, doc.ToCellModel(TestCatalog.Catalog.Resolve), 0.5);
        Assert.Equal(["Scn1a", "Scn8a"], targets.Select(t => t.Name));
        // Scn1a at 50 %: Na expression 100 - 30 = 70, density factor (70/100)^1.5.
        Assert.Equal(Math.Pow(0.7, 1.5), targets[0].Factors[0], 12);
        Assert.Equal(1.0, targets[0].Factors[2]);
        // Scn8a at 50 %: Na 100 - 0.5*0.5*80 = 80; M 40 - 0.5*0.25*80 = 30.
        Assert.Equal(Math.Pow(0.8, 1.5), targets[1].Factors[0], 12);
        Assert.Equal(Math.Pow(30.0 / 40, 1.5), targets[1].Factors[2], 12);
        Assert.All(targets, t => Assert.Equal(KnockdownKind.Gene, t.Kind));
    }

    [Fact]
    public void The_plausible_range_clamp_applies_as_when_the_model_was_built()
    {
        var doc = Doc(exponent: 1, clamp: true);
        var model = doc.ToCellModel(TestCatalog.Catalog.Resolve);
        var na = model.Channels[0].Entry;
        var gone = GeneKnockdowns.Targets(doc, model, 0)[0];
        // Scn1a removed: Na 40/50 of the reference, raw density 0.8 x typical (25) = 20 mS/cm2, then clamped to the range.
        Assert.Equal(Math.Clamp(20.0, na.MinDensityMsPerCm2, na.MaxDensityMsPerCm2) / 50, gone.Factors[0], 12);
    }

    [Fact]
    public void A_model_not_built_from_expression_is_refused_with_a_reason()
    {
        var preset = TestCatalog.Catalog.Preset("wb1996");
        var e = Assert.Throws<ArgumentException>(() => GeneKnockdowns.Targets(preset, preset.ToCellModel(TestCatalog.Catalog.Resolve), 0));
        Assert.Contains("built from expression", e.Message);
        var broken = Doc() with
        {
            Derivation = new JsonObject
            {
                ["exponent"] = 1.0,
                ["densities"] = new JsonArray(new JsonObject { ["entry"] = "traub-na" })
            }
        };
        Assert.Contains("derivation.densities[0].expression",
            Assert.Throws<ArgumentException>(() => GeneKnockdowns.Targets(broken, broken.ToCellModel(TestCatalog.Catalog.Resolve), 0)).Message);
    }
}
