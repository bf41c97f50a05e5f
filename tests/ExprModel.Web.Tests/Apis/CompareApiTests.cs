using System.Net.Http.Json;
using System.Text.Json;

namespace ExprModel.Web.Tests.Apis;

public sealed class CompareApiTests(AppFactory factory) : ApiTestBase(factory)
{
    private static string DemoPath(string file)
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var f = Path.Combine(d.FullName, "catalog", "demo", file);
            if (File.Exists(f)) return f;
        }
        throw new FileNotFoundException(file);
    }

    private static MultipartFormDataContent DemoForm(params (string Name, string Value)[] fields)
    {
        var form = new MultipartFormDataContent
        {
            { new ByteArrayContent(File.ReadAllBytes(DemoPath("counts.csv"))), "expression", "counts.csv" },
            { new ByteArrayContent(File.ReadAllBytes(DemoPath("metadata.csv"))), "metadata", "metadata.csv" },
        };
        foreach (var (name, value) in fields) form.Add(new StringContent(value), name);
        return form;
    }

    [Fact]
    public async Task GroupModelsAgainstTheDemoMetadataGiveEveryLevelOfComparison()
    {
        var r = await Client.PostAsync("/api/compare", DemoForm(("groupBy", "group"), ("per", "group")));
        var body = await Json(r);
        Assert.True(r.IsSuccessStatusCode, body.ToString());
        Assert.Contains("clinical", body.GetProperty("caution").GetString());
        var matches = body.GetProperty("matches").EnumerateArray().ToArray();
        Assert.Equal("rheobase_absolute", matches.Single(m => m.GetProperty("header").GetString() == "rheobase (pA)").GetProperty("readout").GetString());
        Assert.Equal(JsonValueKind.Null, matches.Single(m => m.GetProperty("header").GetString() == "max firing rate (Hz)").GetProperty("readout").ValueKind);
        var agreement = body.GetProperty("agreement").EnumerateArray().ToArray();
        Assert.Equal(["resting_potential", "input_resistance", "rheobase_absolute"], agreement.Select(a => a.GetProperty("readout").GetString()));
        Assert.All(agreement, a => Assert.True(a.GetProperty("cells").GetInt32() > 10));
        Assert.Equal(15, body.GetProperty("groups").GetArrayLength());
        var fh1001 = body.GetProperty("cells").EnumerateArray().Single(c => c.GetProperty("cellId").GetString() == "FH1001"
            && c.GetProperty("readout").GetString() == "rheobase_absolute");
        Assert.Equal(167.0, fh1001.GetProperty("recorded").GetDouble(), 9);
        Assert.Equal("group T1-fast", fh1001.GetProperty("model").GetString());
        Assert.StartsWith("# Research tool.", body.GetProperty("csv").GetString());
    }

    [Fact]
    public async Task PerCellModelsFromAJsonBodyShrinkByDefault()
    {
        var request = new
        {
            expression = File.ReadAllText(DemoPath("counts.csv")),
            expressionName = "counts.csv",
            metadata = File.ReadAllText(DemoPath("metadata.csv")),
            groupBy = "group",
            recorded = "cell_id,Vrest (mV),rheobase (pA)\nFH1001,-71.3,167.0\nFH2003,-69.0,88.0\nFH3004,-63.5,55.0\n",
            map = new Dictionary<string, string> { ["Vrest"] = "resting_potential" },
        };
        var r = await Client.PostAsJsonAsync("/api/compare", request);
        var body = await Json(r);
        Assert.True(r.IsSuccessStatusCode, body.ToString());
        Assert.Contains("shrunk towards each cell's group", body.GetProperty("expressionNote").GetString());
        var cells = body.GetProperty("cells").EnumerateArray().ToArray();
        Assert.Equal(6, cells.Length); // three cells x two read-outs
        Assert.Contains(cells, c => c.GetProperty("cellId").GetString() == "FH2003" && c.GetProperty("model").GetString() == "FH2003");
        Assert.Equal(2, body.GetProperty("agreement").GetArrayLength());
    }

    [Fact]
    public async Task BadRecordedTablesAndOptionsAreProblemsThatSayWhere()
    {
        var unit = new MultipartFormDataContent
        {
            { new ByteArrayContent(File.ReadAllBytes(DemoPath("counts.csv"))), "expression", "counts.csv" },
            { new ByteArrayContent("cell,input resistance (mOhm)\nFH1001,120\n"u8.ToArray()), "recorded", "lab.csv" },
        };
        await AssertProblem(await Client.PostAsync("/api/compare", unit), 400, "lab.csv: line 1, column 2: unknown unit 'mOhm'");

        var stranger = new MultipartFormDataContent
        {
            { new ByteArrayContent(File.ReadAllBytes(DemoPath("counts.csv"))), "expression", "counts.csv" },
            { new ByteArrayContent("cell,rheobase (pA)\nFH1001,120\nXX0001,80\n"u8.ToArray()), "recorded", "lab.csv" },
        };
        await AssertProblem(await Client.PostAsync("/api/compare", stranger), 400, "lab.csv: line 3, column 1: cell 'XX0001'");

        await AssertProblem(await Client.PostAsync("/api/compare", DemoForm(("groupBy", "group"), ("per", "groups"))), 400, "per: 'groups'");
        await AssertProblem(await Client.PostAsync("/api/compare", DemoForm(("groupBy", "group"), ("map", "{\"max firing rate\": \"rate\"}"))), 400,
            "no read-out 'rate'");
        await AssertProblem(await Client.PostAsync("/api/compare", DemoForm(("groupBy", "group"), ("colour", "red"))), 400, "colour: not a field");
        await AssertProblem(await Client.PostAsJsonAsync("/api/compare", new { expression = "gene,c1\nScn1a,3\n" }), 400, "recorded: required");
    }
    [Fact]
    public async Task RecordedSweepsAsFilePartsAreMeasuredAndNameTheirSource()
    {
        var form = DemoForm(("groupBy", "group"), ("shrink", "none"));
        form.Add(new ByteArrayContent(File.ReadAllBytes(DemoPath("recordings/FH1001.nwb"))), "recording", "FH1001.nwb");
        form.Add(new ByteArrayContent(File.ReadAllBytes(DemoPath("recordings/FH2002.nwb"))), "recording2", "FH2002.nwb");
        var r = await Client.PostAsync("/api/compare", form);
        var body = await Json(r);
        Assert.True(r.IsSuccessStatusCode, body.ToString());
        var cells = body.GetProperty("cells").EnumerateArray().ToArray();
        // Only the recorded cells are compared (the metadata's invented columns are not joined unless sent as 'recorded').
        Assert.Equal(["FH1001", "FH2002"], cells.Select(c => c.GetProperty("cellId").GetString()).Distinct().Order());
        var rin = cells.Single(c => c.GetProperty("cellId").GetString() == "FH1001" && c.GetProperty("readout").GetString() == "input_resistance");
        // catalog/demo/recorded-features.csv: FH1001's recording measures 270.782 MOhm.
        Assert.Equal(270.782, rin.GetProperty("recorded").GetDouble(), 2);
        Assert.Equal("sweeps FH1001.nwb", rin.GetProperty("recordedSource").GetString());
    }

    [Fact]
    public async Task BadRecordingUploadsAreProblemsNamingTheFile()
    {
        var form = DemoForm(("groupBy", "group"));
        form.Add(new ByteArrayContent([1, 2, 3, 4]), "recording", "broken.nwb");
        var r = await Client.PostAsync("/api/compare", form);
        Assert.Equal(400, (int)r.StatusCode);
        Assert.Contains("broken.nwb", await r.Content.ReadAsStringAsync());

        var form2 = DemoForm(("groupBy", "group"));
        form2.Add(new ByteArrayContent([1, 2, 3]), "recording", "sweep one.exe");
        var r2 = await Client.PostAsync("/api/compare", form2);
        Assert.Equal(400, (int)r2.StatusCode);
        Assert.Contains("must be letters, digits", await r2.Content.ReadAsStringAsync());
    }
}
