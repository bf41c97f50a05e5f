using ExprModel.Core.Models;
using ExprModel.Data.Catalog;

namespace ExprModel.Cli.Tests.Commands;

public class ExpressionCommandsTests
{
    private static string Demo(string file) => Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo", file);

    private static string[] Inputs => ["--expression", Demo("counts.csv"), "--metadata", Demo("metadata.csv"), "--group-by", "group"];

    [Fact]
    public void BuildWritesAPinnedModelWithItsDerivationAndPrintsTheReport()
    {
        var path = Path.Combine(Path.GetTempPath(), $"built-{Guid.NewGuid():N}.json");
        var (exit, _, err) = CliRunner.Run(["build", .. Inputs, "--group", "T1-fast", "--out", path]);
        Assert.True(exit == 0, err);
        Assert.Contains("mapped channel genes", err);
        Assert.Contains("channel genes not mapped", err);
        var doc = ModelDocument.Parse(File.ReadAllText(path), path);
        Assert.All(doc.Channels, c => Assert.NotNull(c.Version));
        Assert.True(doc.Channels.Count >= 4, $"only {doc.Channels.Count} channels");
        Assert.NotNull(doc.Derivation);
        Assert.Contains("dataset median", doc.Derivation!.ToJsonString());
        Assert.Contains("clinical", doc.Caution);
        // The built model runs: the same file through the features command.
        var f = CliRunner.Run("features", path);
        Assert.True(f.Exit == 0, f.Err);
        File.Delete(path);
    }

    [Fact]
    public void ReadOptionsAreRefusedInTheLibrarysWordsNamingTheOption()
    {
        var (exit, _, err) = CliRunner.Run(["build", .. Inputs, "--group", "T1-fast", "--unit", "umi"]);
        Assert.Equal(1, exit);
        Assert.Contains("error: --unit: 'umi' is not counts, cpm, tpm, fpkm or log-transformed.", err);
        var o = CliRunner.Run(["build", .. Inputs, "--group", "T1-fast", "--orientation", "rows"]);
        Assert.Contains("error: --orientation: 'rows' is not genes-as-rows or cells-as-rows.", o.Err);
    }

    [Fact]
    public void BuildOfOneCellShrinksItsCountsTowardsItsGroupOnlyWhenAsked()
    {
        var plain = CliRunner.Run(["build", .. Inputs, "--cell", "FH1001"]);
        Assert.True(plain.Exit == 0, plain.Err);
        Assert.DoesNotContain("expressionEstimate", plain.Out);
        var shrunk = CliRunner.Run(["build", .. Inputs, "--cell", "FH1001", "--shrink", "group"]);
        Assert.True(shrunk.Exit == 0, shrunk.Err);
        Assert.Contains("note: per-cell expression shrunk towards each cell's group", shrunk.Err);
        var doc = ModelDocument.Parse(shrunk.Out, "stdout");
        Assert.Equal("group T1-fast", doc.Derivation!["expressionEstimate"]!["priorOver"]!.GetValue<string>());
    }

    [Fact]
    public void BuildRefusesAnUnknownGroupNamingTheKnownOnes()
    {
        var (exit, _, err) = CliRunner.Run(["build", .. Inputs, "--group", "T9-none"]);
        Assert.NotEqual(0, exit);
        Assert.Contains("T9-none", err);
        Assert.Contains("T1-fast", err);
    }

    [Fact]
    public void ShardedBatchMergesToTheUnshardedTable()
    {
        string tmp = Path.GetTempPath(), id = Guid.NewGuid().ToString("N");
        string all = Path.Combine(tmp, $"all-{id}.csv"), s1 = Path.Combine(tmp, $"s1-{id}.csv"), s2 = Path.Combine(tmp, $"s2-{id}.csv");
        string merged = Path.Combine(tmp, $"m-{id}.csv");
        var a = CliRunner.Run(["batch", .. Inputs, "--out", all]);
        Assert.True(a.Exit == 0, a.Err);
        Assert.Contains("progress:", a.Err);
        Assert.True(CliRunner.Run(["batch", .. Inputs, "--shard", "1/2", "--out", s1]).Exit == 0);
        Assert.True(CliRunner.Run(["batch", .. Inputs, "--shard", "2/2", "--out", s2]).Exit == 0);
        var m = CliRunner.Run("merge", s2, s1, "--out", merged);
        Assert.True(m.Exit == 0, m.Err);
        string[] Rows(string p) => File.ReadAllLines(p).Where(l => !l.StartsWith('#')).ToArray();
        Assert.Equal(Rows(all), Rows(merged));
        // The whole file, comments included, is the unsharded run's, byte for byte (the shard line reads "shard 1/1").
        Assert.Equal(File.ReadAllBytes(all), File.ReadAllBytes(merged));
        // A rerun of a shard writes the same bytes (idempotent), through a temporary file that does not stay behind.
        var before = File.ReadAllBytes(s1);
        Assert.True(CliRunner.Run(["batch", .. Inputs, "--shard", "1/2", "--out", s1]).Exit == 0);
        Assert.Equal(before, File.ReadAllBytes(s1));
        Assert.Empty(Directory.GetFiles(tmp, $".s1-{id}.csv.*"));
        Assert.Equal(6, Rows(all).Length); // header + five groups of the demo survey
        Assert.Contains("rheobase_pa", Rows(all)[0]);
        // A missing shard is an error that names the gap.
        var gap = CliRunner.Run("merge", s1);
        Assert.NotEqual(0, gap.Exit);
        Assert.Contains("missing", gap.Err);
        foreach (var p in new[] { all, s1, s2, merged }) File.Delete(p);
    }

    [Theory]
    [InlineData("--shard", "3/2", "--shard '3/2'")]
    [InlineData("--per", "tissue", "--per: 'tissue'")]
    public void BatchOptionsAreChecked(string option, string value, string expected)
    {
        var (exit, _, err) = CliRunner.Run(["batch", .. Inputs, option, value]);
        Assert.NotEqual(0, exit);
        Assert.Contains(expected, err);
    }
}
