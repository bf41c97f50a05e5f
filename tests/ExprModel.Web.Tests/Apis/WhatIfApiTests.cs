using System.Net.Http.Json;

namespace ExprModel.Web.Tests.Apis;

public sealed class WhatIfApiTests(AppFactory factory) : ApiTestBase(factory)
{
    [Fact]
    public async Task Knockdown_ranks_what_sets_the_rheobase()
    {
        var body = await Json(await Client.PostAsJsonAsync("/api/whatif/knockdown",
            new { model = Preset("cortex-rs2008"), level = 0.0, readout = "rheobase" }));
        var rows = body.GetProperty("changes").EnumerateArray().ToList();
        Assert.Equal(4, rows.Count);
        // Common practice: removing sodium takes the spike away; lost read-outs rank first.
        Assert.Contains(rows.TakeWhile(r => r.GetProperty("lost").GetBoolean()), r => r.GetProperty("target").GetString() == "traub-na");
        Assert.Contains("Research tool", body.GetProperty("caution").GetString());
    }

    [Fact]
    public async Task Sensitivity_is_heat_map_data_with_kinds()
    {
        var body = await Json(await Client.PostAsJsonAsync("/api/whatif/sensitivity", new { model = Preset("wb1996") }));
        var readouts = body.GetProperty("readouts").EnumerateArray().Select(e => e.GetString()).ToList();
        int rin = readouts.IndexOf("input_resistance"), rest = readouts.IndexOf("resting_potential");
        Assert.Equal("per-log-density", body.GetProperty("kinds")[rest].GetString());
        var leak = body.GetProperty("values")[2];
        // Common practice: more leak, lower input resistance.
        Assert.True(leak[rin].GetDouble() < 0);
        Assert.Equal(3, body.GetProperty("values").GetArrayLength());
    }

    [Fact]
    public async Task Fit_returns_the_fitted_model_and_what_the_data_pin_down()
    {
        var body = await Json(await Client.PostAsJsonAsync("/api/whatif/fit", new
        {
            model = Preset("wb1996"),
            targets = new object[] { new { readout = "rheobase", value = 0.2, unit = "uA/cm2", scale = 0.01 },
                new { readout = "resting_potential", value = -64.0 } },
        }));
        Assert.Equal("exprmodel-model", body.GetProperty("model").GetProperty("format").GetString());
        Assert.True(body.GetProperty("model").GetProperty("derivation").GetProperty("fit").GetProperty("evaluations").GetInt32() > 0);
        Assert.Equal(3, body.GetProperty("singularValues").GetArrayLength());
        Assert.Contains("Expression alone misses", body.GetProperty("summary").GetString());
        Assert.True(body.GetProperty("objectiveAfter").GetDouble() < body.GetProperty("objectiveBefore").GetDouble());
    }

    [Fact]
    public async Task Bad_requests_are_problem_details()
    {
        await AssertProblem(await Client.PostAsJsonAsync("/api/whatif/fit", new { model = Preset("wb1996") }), 400, "targets");
        await AssertProblem(await Client.PostAsJsonAsync("/api/whatif/fit",
            new { model = Preset("wb1996"), targets = new[] { new { readout = "rheobse", value = 1.0 } } }), 400, "targets[0]", "rheobse");
        await AssertProblem(await Client.PostAsJsonAsync("/api/whatif/knockdown", new { model = Preset("wb1996"), genes = true }), 400,
            "built from expression");
        await AssertProblem(await Client.PostAsJsonAsync("/api/whatif/sensitivity", new { model = Preset("wb1996"), stepLn = 5.0 }), 400, "stepLn");
    }
    [Fact]
    public async Task Fit_takes_its_targets_from_a_recorded_table_or_recorded_sweeps()
    {
        var body = await Json(await Client.PostAsJsonAsync("/api/whatif/fit", new
        {
            model = Preset("wb1996"),
            recorded = "cell,group,resting potential (mV)\na1,A,-66\na2,A,-64\na3,A,-65\nb1,B,-70\n",
            group = "A",
        }));
        // Mean -65 mV scaled by the sample SD of -66, -64, -65 (1 mV).
        var target = body.GetProperty("residuals").EnumerateArray().Single();
        Assert.Equal(-65, target.GetProperty("recorded").GetDouble(), 9);
        Assert.Equal(1, target.GetProperty("scale").GetDouble(), 9);
        Assert.Contains(body.GetProperty("targetNotes").EnumerateArray(), n => n.GetString()!.Contains("mean of 3 cells"));

        string nwb = null!;
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null && nwb is null; d = d.Parent)
            if (File.Exists(Path.Combine(d.FullName, "catalog", "demo", "recordings", "FH1001.nwb")))
                nwb = Path.Combine(d.FullName, "catalog", "demo", "recordings", "FH1001.nwb");
        var swept = await Json(await Client.PostAsJsonAsync("/api/whatif/fit", new
        {
            model = Preset("wb1996"),
            recordings = new[] { new { name = "FH1001.nwb", contentBase64 = Convert.ToBase64String(File.ReadAllBytes(nwb!)) } },
            cell = "FH1001",
            fitReadouts = new[] { "resting_potential" },
        }));
        // catalog/demo/recorded-features.csv: FH1001 rests at -80.2095 mV.
        Assert.Equal(-80.2095, swept.GetProperty("residuals").EnumerateArray().Single().GetProperty("recorded").GetDouble(),
            tolerance: 1e-3); // the table rounds to six significant digits

        await AssertProblem(await Client.PostAsJsonAsync("/api/whatif/fit",
            new { model = Preset("wb1996"), recorded = "cell,resting potential (mV)\na1,-66\n", cell = "zz" }), 400, "zz");
    }
}
