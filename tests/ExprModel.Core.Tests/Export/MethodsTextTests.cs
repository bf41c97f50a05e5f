using System.Globalization;
using ExprModel.Core.Analysis;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Export;

/// <summary>The methods paragraph names every channel with its citation key and numbers taken from the model itself.</summary>
public sealed class MethodsTextTests
{
    [Theory]
    [InlineData("hh1952")]
    [InlineData("wb1996")]
    [InlineData("cortex-rs2008")]
    [InlineData("cortex-fs2008")]
    public void Every_channel_its_citation_density_temperature_and_q10_appear(string preset)
    {
        var doc = TestCatalog.Catalog.Preset(preset);
        var model = TestCatalog.Catalog.BuildCell(doc);
        var versions = new MethodsVersions("9.9.9", "schema 1, sources abc");
        var settings = ReadoutSettings.Default with { Simulation = new SimulationSettings { DtMs = 0.01 } };
        string text = MethodsText.Write(doc, model, versions, settings);
        var (entries, keys) = BibTex.For(model, doc.Citation, versions);
        var bibKeys = BibTexTests.Parse(BibTex.Write(entries, ResearchCaution.Text)).Select(r => r.Key).ToHashSet();
        foreach (var c in model.Channels)
        {
            Assert.Contains(c.Entry.Name, text);
            Assert.Contains($"[{keys[c.Entry.Key]}]", text);
            Assert.Contains(keys[c.Entry.Key], bibKeys);
            Assert.Contains($"at {c.DensityMsPerCm2.ToString(CultureInfo.InvariantCulture)} mS/cm2", text);
            Assert.Contains($"kinetics at {c.Entry.ReferenceTemperatureC.ToString(CultureInfo.InvariantCulture)} °C with Q10 = " +
                c.Entry.Q10.ToString(CultureInfo.InvariantCulture), text);
            Assert.Contains($"{c.Entry.Id} v{c.Entry.Version}", text);
        }
        Assert.Contains($"at {model.TemperatureC.ToString(CultureInfo.InvariantCulture)} °C.", text);
        Assert.Contains("fixed step of 10 us", text);
        Assert.Contains("ExprModel 9.9.9; channel catalog schema 1, sources abc", text);
        Assert.EndsWith(ResearchCaution.Text, text);
    }

    [Fact]
    public void The_squid_axon_model_at_6_3_C_states_its_rate_factor_from_Q10()
    {
        // Hodgkin & Huxley 1952 kinetics are at 6.3 C; the preset runs at its own temperature, and Q10^((T - 6.3)/10) is printed.
        var doc = TestCatalog.Catalog.Preset("hh1952");
        var model = TestCatalog.Catalog.BuildCell(doc);
        var na = model.Channels.First(c => c.Entry.Id == "squid-na-hh1952");
        double factor = Math.Pow(na.Entry.Q10, (model.TemperatureC - na.Entry.ReferenceTemperatureC) / 10);
        string text = MethodsText.Write(doc, model, new MethodsVersions("1", "c"));
        Assert.Contains($"(rate factor {MethodsText.N(factor)})", text);
        Assert.Equal("28952.9", MethodsText.N(28952.9179));
        Assert.Equal("0.07", MethodsText.N(0.07));
    }
}
