using System.Net.Http.Json;
using System.Text;

namespace ExprModel.Web.Tests.Apis;

public sealed class SimulationApiTests(AppFactory factory) : ApiTestBase(factory)
{
    [Fact]
    public async Task Simulate_returns_the_trace_and_spikes_of_a_step()
    {
        var quiet = await Json(await Client.PostAsJsonAsync("/api/simulate", new { model = Preset("hh1952"), step = new { amplitudeUaPerCm2 = 0.0 } }));
        var firing = await Json(await Client.PostAsJsonAsync("/api/simulate", new { model = Preset("hh1952"), step = new { amplitudeUaPerCm2 = 15.0 } }));
        Assert.Empty(quiet.GetProperty("spikeTimesMs").EnumerateArray());
        Assert.True(firing.GetProperty("spikeTimesMs").GetArrayLength() > 5);
        var t = firing.GetProperty("timeMs");
        Assert.Equal(firing.GetProperty("voltageMv").GetArrayLength(), t.GetArrayLength());
        Assert.Equal(700, t[t.GetArrayLength() - 1].GetDouble(), 6);
        Assert.Contains("Research tool", firing.GetProperty("caution").GetString());
    }

    [Fact]
    public async Task The_fi_curve_has_one_point_per_step_and_rises()
    {
        var body = await Json(await Client.PostAsJsonAsync("/api/fi",
            new { model = Preset("wb1996"), fi = new { fromUaPerCm2 = 0, toUaPerCm2 = 4, steps = 5, durationMs = 500 } }));
        var pts = body.GetProperty("points").EnumerateArray().ToList();
        Assert.Equal(5, pts.Count);
        Assert.Equal(0, pts[0].GetProperty("spikesInStep").GetInt32());
        Assert.True(pts[4].GetProperty("wholeStepRateHz").GetDouble() > pts[1].GetProperty("wholeStepRateHz").GetDouble());
    }

    [Fact]
    public async Task Bad_protocols_and_bodies_are_problem_details()
    {
        await AssertProblem(await Client.PostAsJsonAsync("/api/fi", new { model = Preset("wb1996"), fi = new { fromUaPerCm2 = 5, toUaPerCm2 = 1, steps = 5 } }),
            400, "toUaPerCm2");
        await AssertProblem(await Client.PostAsJsonAsync("/api/fi", new { model = Preset("wb1996"), fi = new { steps = 5000 } }), 400, "fi.steps");
        await AssertProblem(await Client.PostAsJsonAsync("/api/simulate", new { model = Preset("wb1996"), step = new { stepMs = 60000 } }), 400, "10000 ms");
        var truncated = new StringContent("{\"model\": {\"format\": ", Encoding.UTF8, "application/json");
        await AssertProblem(await Client.PostAsync("/api/readouts", truncated), 400, "line 1");
        var wrongFormat = new
        {
            model = new
            {
                format = "something-else",
                schemaVersion = 1,
                cell = new { areaUm2 = 100 },
                channels = new[] { new { entry = "leak", densityMsPerCm2 = 0.1 } }
            }
        };
        await AssertProblem(await Client.PostAsJsonAsync("/api/readouts", wrongFormat), 400, "format");
    }

    [Fact]
    public async Task Uploads_over_the_limit_are_refused_with_a_clear_message()
    {
        var table = "gene,c1\n" + string.Concat(Enumerable.Range(0, 80_000).Select(i => $"G{i},{i}\n"));
        var big = JsonContent.Create(new { expression = table, cell = "c1" });
        await big.LoadIntoBufferAsync();
        Assert.True(big.Headers.ContentLength > 1024 * 1024);
        await AssertProblem(await Client.PostAsync("/api/build", big), 413, "upload limit", "1 MB");
        // Just under the limit is read (and then judged on its content).
        var small = await Client.PostAsJsonAsync("/api/build", new { expression = "gene,c1\nScn1a,2\n", cell = "c1" });
        Assert.NotEqual(413, (int)small.StatusCode);
    }

    [Fact]
    public async Task Pages_carry_the_security_headers()
    {
        var r = await Client.GetAsync("/");
        Assert.Equal("nosniff", r.Headers.GetValues("X-Content-Type-Options").Single());
        Assert.Equal("no-referrer", r.Headers.GetValues("Referrer-Policy").Single());
        var csp = r.Headers.GetValues("Content-Security-Policy").Single();
        Assert.Contains("frame-ancestors 'none'", csp);
        Assert.Contains("script-src 'self'", csp);
        Assert.DoesNotContain("unsafe-eval", csp);
    }
}
