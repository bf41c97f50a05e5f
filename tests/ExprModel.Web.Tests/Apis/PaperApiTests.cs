using System.Net.Http.Json;

namespace ExprModel.Web.Tests.Apis;

public sealed class PaperApiTests(AppFactory factory) : ApiTestBase(factory)
{
    [Fact]
    public async Task Mechanisms_name_the_M_current_on_the_regular_spiking_preset()
    {
        // Pospischil et al. 2008: the regular-spiking model adapts through its M-current (common practice: it builds up over a train).
        var body = await Json(await Client.PostAsJsonAsync("/api/mechanisms", new { model = Preset("cortex-rs2008") }));
        Assert.Equal("kv7-m-yamada", body.GetProperty("building_up").GetString());
        Assert.Contains("clinical", body.GetProperty("caution").GetString());
        Assert.True(body.GetProperty("spikes").GetArrayLength() >= 10);
        var csv = await Client.PostAsJsonAsync("/api/mechanisms", new { model = Preset("cortex-rs2008"), amplitudeUaPerCm2 = 2.0, format = "csv" });
        string text = await csv.Content.ReadAsStringAsync();
        Assert.StartsWith("# Research tool", text);
        Assert.Contains("ramp_current_kv7-m-yamada_ua_per_cm2", text);
        await AssertProblem(await Client.PostAsJsonAsync("/api/mechanisms", new { model = Preset("hh1952"), amplitudeUaPerCm2 = -1.0 }), 400,
            "amplitudeUaPerCm2");
    }

    [Fact]
    public async Task Methods_cite_every_channel_and_come_with_the_BibTeX()
    {
        var body = await Json(await Client.PostAsJsonAsync("/api/methods", new { model = Preset("wb1996") }));
        string methods = body.GetProperty("methods").GetString()!;
        string bib = body.GetProperty("bibTex").GetString()!;
        // Wang & Buzsaki 1996 (J Neurosci 16:6402): the preset's sodium and potassium entries cite it; densities 35 and 9 mS/cm2.
        Assert.Contains("[Wang1996]", methods);
        Assert.Contains("at 35 mS/cm2", methods);
        Assert.Contains("at 9 mS/cm2", methods);
        Assert.Contains("@article{Wang1996,", bib);
        Assert.Contains("clinical", body.GetProperty("caution").GetString());
        var missing = await Client.GetAsync("/api/models/AAAAAAAAAAAAAAAAAAAAAA/methods");
        Assert.Equal(404, (int)missing.StatusCode);
    }
}
