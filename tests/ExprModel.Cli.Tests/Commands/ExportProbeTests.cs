using ExprModel.Core.Tests.Export;

namespace ExprModel.Cli.Tests.Commands;

/// <summary>The formula probes through every CSV the command line writes from a model or shard a user controls.</summary>
public sealed class ExportProbeTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("exprmodel-probes-").FullName;

    public static TheoryData<string> Probes() => [.. FormulaProbes.All];

    private string ModelNamed(string name)
    {
        var path = Path.Combine(_dir, Guid.NewGuid().ToString("N") + ".json");
        var escaped = System.Text.Json.JsonSerializer.Serialize(name);
        File.WriteAllText(path, "{\"format\": \"exprmodel-model\", \"schemaVersion\": 1, \"name\": " + escaped + ", \"cell\": { \"areaUm2\": 1000 }, " +
            "\"channels\": [ { \"entry\": \"leak\", \"densityMsPerCm2\": 0.1 } ]}");
        return path;
    }

    [Theory]
    [MemberData(nameof(Probes))]
    public void Simulate_fi_and_vclamp_csv_are_inert_for_a_hostile_model_name(string probe)
    {
        var model = ModelNamed(probe);
        foreach (var args in new[]
        {
            new[] { "simulate", model, "--amplitude", "1", "--duration", "5", "--delay", "1", "--total", "7" },
            ["fi", model, "--from", "-1", "--to", "1", "--steps", "2", "--duration", "20"],
            ["clamp-steps", model, "--from", "-80", "--to", "-60", "--step", "10", "--length", "5"],
        })
        {
            var (exit, stdout, err) = CliRunner.Run(args);
            Assert.True(exit == 0, err);
            Assert.Contains("model: ", stdout);
            FormulaProbes.AssertInert(stdout, args[0]);
        }
    }

    [Theory]
    [MemberData(nameof(Probes))]
    public void Merge_rewrites_a_hand_edited_shard_through_the_neutralising_writer(string probe)
    {
        var shard = Path.Combine(_dir, "shard.csv");
        probe = probe.Replace('\r', ' '); // merge reads shards line by line: a bare CR ends a line there, as in any shard
        var cell = "\"" + probe.Replace("\"", "\"\"") + "\"";
        File.WriteAllText(shard, $"# source: {probe}\n# shard 1/1 of 2 items\nitem_index,item,rate_hz\n0,{probe.Split(',')[0]},-2.5\n1,{cell},3\n");
        var (exit, stdout, err) = CliRunner.Run("merge", shard);
        Assert.True(exit == 0, err);
        Assert.Contains("-2.5", stdout);
        FormulaProbes.AssertInert(stdout, "merge");
    }

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }
}
