using System.Net.Http.Json;

namespace ExprModel.Web.Tests.Apis;

public sealed class BuildApiTests(AppFactory factory) : ApiTestBase(factory)
{
    private static string Demo(string file)
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var f = Path.Combine(d.FullName, "catalog", "demo", file);
            if (File.Exists(f)) return File.ReadAllText(f);
        }
        throw new FileNotFoundException(file);
    }

    [Fact]
    public async Task Builds_a_group_model_from_the_demo_survey_recording_its_derivation()
    {
        var r = await Client.PostAsJsonAsync("/api/build", new { expression = Demo("counts.csv"), metadata = Demo("metadata.csv"), groupBy = "group", group = "T1-fast" });
        Assert.Equal(200, (int)r.StatusCode);
        var body = await Json(r);
        var model = body.GetProperty("model");
        Assert.Equal("exprmodel-model", model.GetProperty("format").GetString());
        Assert.Contains("T1-fast", model.GetProperty("derivation").GetProperty("target").GetString());
        Assert.True(model.GetProperty("channels").GetArrayLength() >= 2);
        Assert.NotEmpty(body.GetProperty("densities").EnumerateArray());
        Assert.Contains("Research tool", model.GetProperty("caution").GetString());

        // The built model runs through the same read-out path.
        var readouts = await Json(await Client.PostAsJsonAsync("/api/readouts", new { model = System.Text.Json.Nodes.JsonNode.Parse(model.GetRawText()) }));
        Assert.NotEmpty(readouts.GetProperty("readouts").EnumerateArray());
    }

    [Fact]
    public async Task Excluding_a_gene_changes_the_model()
    {
        var plain = await Json(await Client.PostAsJsonAsync("/api/build", new { expression = Demo("counts.csv"), metadata = Demo("metadata.csv"), groupBy = "group", group = "T1-fast" }));
        var densities = plain.GetProperty("densities").EnumerateArray().ToList();
        var gene = densities.SelectMany(d => d.GetProperty("genes").EnumerateArray()).First().GetProperty("gene").GetString()!;
        var without = await Json(await Client.PostAsJsonAsync("/api/build", new
        {
            expression = Demo("counts.csv"), metadata = Demo("metadata.csv"), groupBy = "group", group = "T1-fast",
            overrides = new[] { new { gene, exclude = true } },
        }));
        Assert.NotEqual(plain.GetProperty("model").GetProperty("channels").GetRawText(), without.GetProperty("model").GetProperty("channels").GetRawText());
    }

    [Fact]
    public async Task A_bad_table_is_a_problem_naming_the_place()
    {
        var ragged = "gene,c1,c2,c3\nScn1a,1,2,3\nKcnc1,4,5\n";
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { expression = ragged, cell = "c1" }), 400, "line 3");
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { expression = "gene,c1\nScn1a,1\n", group = "x" }), 400, "metadata");
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { cell = "c1" }), 400, "expression");
        await AssertProblem(await Client.PostAsJsonAsync("/api/build", new { expression = Demo("counts.csv"), metadata = Demo("metadata.csv"), groupBy = "group", group = "T9-none" }), 400, "T9-none");
    }
}
