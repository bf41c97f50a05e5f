using System.Net.Http.Json;
using System.Text.Json;
using System.Text.Json.Nodes;

namespace ExprModel.Web.Tests.Apis;

public sealed class ModelsApiTests(AppFactory factory) : ApiTestBase(factory)
{
    [Fact]
    public async Task A_snapshot_round_trip_returns_the_same_model_and_readouts()
    {
        var model = Preset("cortex-rs2008");
        model["channels"]![2]!["relativeDensity"] = 1.7;
        var post = await Client.PostAsJsonAsync("/api/models", new { model, notes = "stronger M-current" });
        Assert.Equal(201, (int)post.StatusCode);
        var saved = await Json(post);
        string id = saved.GetProperty("id").GetString()!;
        Assert.Matches("^[A-Za-z0-9_-]{22}$", id);
        Assert.EndsWith("/m/" + id, saved.GetProperty("link").GetString());
        Assert.Equal($"/api/models/{id}", post.Headers.Location!.OriginalString);

        var got = await Json(await Client.GetAsync($"/api/models/{id}"));
        Assert.Equal("stronger M-current", got.GetProperty("notes").GetString());
        Assert.Equal(saved.GetProperty("readouts").GetRawText(), got.GetProperty("readouts").GetRawText());
        Assert.Contains("Research tool", got.GetProperty("caution").GetString());
        var stored = got.GetProperty("model");
        Assert.Equal(1.7, stored.GetProperty("channels")[2].GetProperty("relativeDensity").GetDouble());
        // Every channel is pinned to a catalog version, and those versions are listed.
        foreach (var c in stored.GetProperty("channels").EnumerateArray()) Assert.True(c.GetProperty("version").GetInt32() >= 1);
        Assert.Contains("kv7-m-yamada@1", got.GetProperty("catalogVersions").EnumerateArray().Select(v => v.GetString()));

        // Re-running the stored model gives the stored read-outs exactly.
        var rerun = await Json(await Client.PostAsJsonAsync("/api/readouts", new { model = JsonNode.Parse(stored.GetRawText()) }));
        Assert.Equal(got.GetProperty("readouts").GetRawText(), rerun.GetProperty("readouts").GetRawText());
        Assert.Contains(rerun.GetProperty("readouts").EnumerateArray(), r => r.GetProperty("name").GetString() == "rheobase"
            && r.GetProperty("value").ValueKind == JsonValueKind.Number);
    }

    [Fact]
    public async Task An_edit_records_its_parent()
    {
        var first = await Json(await Client.PostAsJsonAsync("/api/models", new { model = Preset("wb1996") }));
        string parent = first.GetProperty("id").GetString()!;
        var second = await Json(await Client.PostAsJsonAsync("/api/models", new { model = Preset("wb1996"), parentId = parent, notes = "edit" }));
        var got = await Json(await Client.GetAsync($"/api/models/{second.GetProperty("id").GetString()}"));
        Assert.Equal(parent, got.GetProperty("parentId").GetString());
        Assert.NotEqual(parent, second.GetProperty("id").GetString());
    }

    [Fact]
    public async Task The_expression_table_is_stored_only_when_sent()
    {
        var without = await Json(await Client.PostAsJsonAsync("/api/models", new { model = Preset("wb1996") }));
        var with = await Json(await Client.PostAsJsonAsync("/api/models",
            new { model = Preset("wb1996"), expression = "gene,c1\nScn1a,3\n", expressionName = "t.csv" }));
        Assert.False((await Json(await Client.GetAsync($"/api/models/{without.GetProperty("id").GetString()}"))).GetProperty("hasExpression").GetBoolean());
        Assert.True((await Json(await Client.GetAsync($"/api/models/{with.GetProperty("id").GetString()}"))).GetProperty("hasExpression").GetBoolean());
    }

    [Fact]
    public async Task Bad_snapshot_requests_are_problem_details_naming_the_field()
    {
        await AssertProblem(await Client.GetAsync("/api/models/AAAAAAAAAAAAAAAAAAAAAA"), 404, "AAAAAAAAAAAAAAAAAAAAAA");
        await AssertProblem(await Client.PostAsJsonAsync("/api/models", new { notes = "no model" }), 400, "model");
        await AssertProblem(await Client.PostAsJsonAsync("/api/models", new { model = Preset("wb1996"), parentId = "AAAAAAAAAAAAAAAAAAAAAA" }), 400,
            "parentId");
        var broken = Preset("wb1996");
        broken["channels"]![0]!["entry"] = "no-such-entry";
        await AssertProblem(await Client.PostAsJsonAsync("/api/models", new { model = broken }), 400, "no-such-entry");
        var negative = Preset("wb1996");
        negative["channels"]![1]!["densityMsPerCm2"] = -3;
        await AssertProblem(await Client.PostAsJsonAsync("/api/models", new { model = negative }), 400, "channels[1]", "densityMsPerCm2");
    }
}
