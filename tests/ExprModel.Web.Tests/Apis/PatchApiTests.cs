using System.Net.Http.Json;

namespace ExprModel.Web.Tests.Apis;

public sealed class PatchApiTests(AppFactory factory) : ApiTestBase(factory)
{
    [Fact]
    public async Task A_patch_returns_sweeps_mean_beside_deterministic_dwell_histograms_and_the_caution()
    {
        var body = await Json(await Client.PostAsJsonAsync("/api/patch",
            new { entry = "squid-na-hh1952", channels = 20, holdingMv = -90, stepMv = 0, preStepMs = 2, stepMs = 10, sweeps = 50, keptSweeps = 3 }));
        int n = body.GetProperty("timesMs").GetArrayLength();
        Assert.Equal(n, body.GetProperty("meanPa").GetArrayLength());
        Assert.Equal(n, body.GetProperty("deterministicPa").GetArrayLength());
        Assert.Equal(3, body.GetProperty("sweepsPa").GetArrayLength());
        Assert.True(body.GetProperty("openDwells").GetProperty("count").GetInt32() > 0);
        // The catalog's family default for a squid-axon sodium entry (Sigworth & Neher 1980, about 18 pS).
        Assert.Equal(18, body.GetProperty("unitaryConductancePs").GetDouble());
        Assert.StartsWith("family default", body.GetProperty("unitaryConductanceBasis").GetString(), StringComparison.Ordinal);
        Assert.Contains("Research tool", body.GetProperty("caution").GetString());
    }

    [Fact]
    public async Task Bad_patch_requests_are_problem_details_naming_the_field()
    {
        await AssertProblem(await Client.PostAsJsonAsync("/api/patch", new { entry = "no-such-entry" }), 400, "entry");
        await AssertProblem(await Client.PostAsJsonAsync("/api/patch", new { entry = "squid-k-hh1952", channels = 0 }), 400, "channels");
        await AssertProblem(await Client.PostAsJsonAsync("/api/patch", new { entry = "leak" }), 400, "no gates");
    }
}
