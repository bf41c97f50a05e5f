namespace ExprModel.Web.Tests.Apis;

public sealed class CatalogApiTests(AppFactory factory) : ApiTestBase(factory)
{
    [Fact]
    public async Task Lists_the_latest_entries_with_citation_and_status()
    {
        var body = await Json(await Client.GetAsync("/api/catalog"));
        var ids = body.EnumerateArray().Select(e => e.GetProperty("id").GetString()).ToList();
        Assert.Contains("wb-na-1996", ids);
        Assert.Contains("squid-k-hh1952", ids);
        var wb = body.EnumerateArray().First(e => e.GetProperty("id").GetString() == "wb-na-1996");
        Assert.Contains("Wang", wb.GetProperty("citation").GetString());
        Assert.Contains(wb.GetProperty("verification").GetString(), new[] { "recalled", "checked" });
    }

    [Fact]
    public async Task Entries_say_which_genes_are_proxies_and_whether_the_citation_was_confirmed()
    {
        var body = await Json(await Client.GetAsync("/api/catalog"));
        var kv2 = body.EnumerateArray().First(e => e.GetProperty("id").GetString() == "kv2-cortex-mainen1996");
        var links = kv2.GetProperty("geneLinks").EnumerateArray().ToDictionary(l => l.GetProperty("symbol").GetString()!);
        // Issue 17: EAG (KCNH1) fed the Kv2 delayed rectifier as a proxy until it got its own EAG entry; KCNB1 (Kv2.1) is Kv2's own.
        Assert.False(links.ContainsKey("KCNH1"));
        Assert.False(links["KCNB1"].GetProperty("proxy").GetBoolean());
        var eag = body.EnumerateArray().First(e => e.GetProperty("id").GetString() == "kv10-eag-ludwig1994");
        var kcnh1 = eag.GetProperty("geneLinks").EnumerateArray().Single(l => l.GetProperty("symbol").GetString() == "KCNH1");
        Assert.False(kcnh1.GetProperty("proxy").GetBoolean());
        Assert.All(body.EnumerateArray(), e =>
            Assert.Contains(e.GetProperty("citationCheck").GetString(), new[] { "unchecked", "confirmed", "not-found" }));
        var butera = await Json(await Client.GetAsync("/api/catalog/nap-prebotc-butera1999"));
        Assert.Equal("confirmed", butera.GetProperty("entry").GetProperty("citationCheck").GetString());
        Assert.StartsWith("http", butera.GetProperty("entry").GetProperty("citationCheckedAt").GetString());
        Assert.Equal("recalled", butera.GetProperty("entry").GetProperty("verification").GetString());
    }

    [Fact]
    public async Task Filters_by_text_family_and_ion()
    {
        var sodium = await Json(await Client.GetAsync("/api/catalog?ion=sodium"));
        Assert.NotEmpty(sodium.EnumerateArray());
        Assert.All(sodium.EnumerateArray(), e => Assert.Equal("sodium", e.GetProperty("ion").GetString()));
        var squid = await Json(await Client.GetAsync("/api/catalog?q=squid"));
        Assert.All(squid.EnumerateArray(), e => Assert.Contains("squid", e.GetProperty("id").GetString()));
        var none = await Json(await Client.GetAsync("/api/catalog?q=no-such-channel-anywhere"));
        Assert.Empty(none.EnumerateArray());
    }

    [Fact]
    public async Task An_entry_has_curves_scaled_to_the_requested_temperature()
    {
        var at6 = await Json(await Client.GetAsync("/api/catalog/squid-k-hh1952?temperatureC=6.3"));
        var at16 = await Json(await Client.GetAsync("/api/catalog/squid-k-hh1952?temperatureC=16.3"));
        var tau6 = at6.GetProperty("curves")[0].GetProperty("timeConstantMs")[100].GetDouble();
        var tau16 = at16.GetProperty("curves")[0].GetProperty("timeConstantMs")[100].GetDouble();
        double q10 = at6.GetProperty("entry").GetProperty("q10").GetDouble();
        // Ten degrees warmer: rates times Q10, so time constants divided by Q10.
        Assert.Equal(tau6 / q10, tau16, 9);
        var steady = at6.GetProperty("curves")[0].GetProperty("steadyState").EnumerateArray().Select(x => x.GetDouble()).ToArray();
        Assert.All(steady, s => Assert.InRange(s, 0, 1));
        Assert.True(steady[^1] > steady[0]);
    }

    [Fact]
    public async Task Unknown_entries_and_bad_temperatures_are_problem_details()
    {
        await AssertProblem(await Client.GetAsync("/api/catalog/no-such-entry"), 404, "no-such-entry");
        await AssertProblem(await Client.GetAsync("/api/catalog/leak?version=99"), 404, "version 99");
        await AssertProblem(await Client.GetAsync("/api/catalog/leak?temperatureC=90"), 400, "temperatureC");
    }

    [Fact]
    public async Task The_openapi_document_lists_every_endpoint()
    {
        var doc = await Client.GetStringAsync("/openapi/v1.json");
        foreach (var path in new[]
            { "/api/catalog", "/api/catalog/{id}", "/api/models", "/api/models/{id}", "/api/simulate", "/api/fi", "/api/readouts", "/api/build" })
            Assert.Contains($"\"{path}\"", doc);
    }

    [Fact]
    public async Task An_entry_shows_both_gate_forms_and_its_parameter_counts()
    {
        // Hodgkin & Huxley 1952: n is written as rates; x_inf = alpha/(alpha + beta) and tau = 1/(alpha + beta) at every voltage listed.
        var body = await Json(await Client.GetAsync("/api/catalog/squid-k-hh1952?temperatureC=6.3"));
        var n = body.GetProperty("gateForms")[0];
        Assert.Equal("rates", n.GetProperty("writtenAs").GetString());
        Assert.Equal(6, n.GetProperty("parameterCount").GetInt32());
        Assert.Equal(6, body.GetProperty("parameterCount").GetInt32());
        foreach (var p in n.GetProperty("points").EnumerateArray())
        {
            double a = p.GetProperty("alphaPerMs").GetDouble(), b = p.GetProperty("betaPerMs").GetDouble();
            Assert.Equal(a / (a + b), p.GetProperty("steadyState").GetDouble(), 12);
            Assert.Equal(1 / (a + b), p.GetProperty("timeConstantMs").GetDouble(), 9);
        }
    }
}
