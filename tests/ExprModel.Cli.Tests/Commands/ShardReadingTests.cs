using ExprModel.Data.Catalog;
using PureHDF;

namespace ExprModel.Cli.Tests.Commands;

/// <summary>
/// batch --per cell --shard with dataset references: each shard reads only its own cells, and the merged shards equal
/// one unsharded run row for row, with and without per-cell shrinkage; references made with other settings are refused.
/// And --matrix for .h5ad tables.
/// </summary>
public sealed class ShardReadingTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("exprmodel-shards-").FullName;
    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private static string Demo(string file) => Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo", file);

    /// <summary>The demo counts cut to their first 18 cells (genes as rows), so a per-cell batch stays short.</summary>
    private string SmallTable()
    {
        var path = Path.Combine(_dir, "small.csv");
        File.WriteAllLines(path, File.ReadLines(Demo("counts.csv")).Select(l => string.Join(',', l.Split(',').Take(19))));
        return path;
    }

    private static string[] Rows(string p) => File.ReadAllLines(p).Where(l => !l.StartsWith('#')).ToArray();

    [Fact]
    public void ShardsWithReferences_ReadOnlyTheirCells_AndMergeToTheUnshardedTable()
    {
        string table = SmallTable(), refs = Path.Combine(_dir, "refs.json"), all = Path.Combine(_dir, "all.csv");
        var w = CliRunner.Run("batch", "--expression", table, "--per", "cell", "--write-references", refs);
        Assert.True(w.Exit == 0, w.Err);
        Assert.Contains("dataset references of 18 cells", w.Err);
        var a = CliRunner.Run("batch", "--expression", table, "--per", "cell", "--out", all);
        Assert.True(a.Exit == 0, a.Err);
        var shards = new List<string>();
        for (int i = 1; i <= 3; i++)
        {
            string s = Path.Combine(_dir, $"s{i}.csv");
            var r = CliRunner.Run("batch", "--expression", table, "--per", "cell", "--shard", $"{i}/3", "--references", refs, "--out", s);
            Assert.True(r.Exit == 0, r.Err);
            Assert.Contains("6 cells", r.Err); // the shard's table holds its own six cells only
            Assert.Contains($"read cells {(i - 1) * 6}..{i * 6 - 1}", r.Err);
            shards.Add(s);
        }
        string merged = Path.Combine(_dir, "merged.csv");
        var m = CliRunner.Run(["merge", .. shards, "--out", merged]);
        Assert.True(m.Exit == 0, m.Err);
        Assert.Equal(19, Rows(all).Length);
        Assert.Equal(Rows(all), Rows(merged));
    }

    /// <summary>
    /// The demo counts cut to 16 cells, the first three of each of the five metadata groups plus FH1004, and the demo
    /// metadata without FH1004's row, so one cell falls into "the cells without a group".
    /// </summary>
    private (string Table, string Metadata) SmallGroupedTable()
    {
        int[] columns = [0, 1, 2, 3, 4, 49, 50, 51, 97, 98, 99, 145, 146, 147, 193, 194, 195];
        string table = Path.Combine(_dir, "grouped.csv"), metadata = Path.Combine(_dir, "metadata.csv");
        File.WriteAllLines(table, File.ReadLines(Demo("counts.csv")).Select(l => l.Split(',')).Select(f => string.Join(',', columns.Select(c => f[c]))));
        Assert.StartsWith("gene,FH1001,FH1002,FH1003,FH1004,FH2001,", File.ReadLines(table).First());
        File.WriteAllLines(metadata, File.ReadLines(Demo("metadata.csv")).Where(l => !l.StartsWith("FH1004,", StringComparison.Ordinal)));
        return (table, metadata);
    }

    [Fact]
    public void ShrinkShardsWithReferences_ReadOnlyTheirCells_AndMergeToTheUnshardedTable()
    {
        var (table, metadata) = SmallGroupedTable();
        string refs = Path.Combine(_dir, "refs.json"), all = Path.Combine(_dir, "all.csv"), none = Path.Combine(_dir, "none.csv");
        string[] options = ["--expression", table, "--metadata", metadata, "--group-by", "group", "--per", "cell", "--shrink", "group"];
        var w = CliRunner.Run(["batch", .. options, "--write-references", refs]);
        Assert.True(w.Exit == 0, w.Err);
        Assert.Contains("dataset references of 16 cells", w.Err);
        Assert.Contains("shrinkage priors of", w.Err);
        string json = File.ReadAllText(refs);
        Assert.Contains("\"shrinkage\"", json);
        Assert.Contains("\"group T5-pacing\"", json);
        Assert.Contains("\"the cells without a group\"", json);
        var a = CliRunner.Run(["batch", .. options, "--out", all]);
        Assert.True(a.Exit == 0, a.Err);
        var shards = new List<string>();
        for (int i = 1; i <= 4; i++)
        {
            string s = Path.Combine(_dir, $"s{i}.csv");
            var r = CliRunner.Run(["batch", .. options, "--shard", $"{i}/4", "--references", refs, "--out", s]);
            Assert.True(r.Exit == 0, r.Err);
            Assert.Contains("4 cells", r.Err); // the shard's table holds its own four cells only
            Assert.Contains($"read cells {(i - 1) * 4}..{i * 4 - 1}", r.Err);
            Assert.Contains("per-cell expression shrunk", r.Err);
            shards.Add(s);
        }
        string merged = Path.Combine(_dir, "merged.csv");
        var m = CliRunner.Run(["merge", .. shards, "--out", merged]);
        Assert.True(m.Exit == 0, m.Err);
        Assert.Equal(17, Rows(all).Length);
        Assert.Equal(File.ReadAllLines(all), File.ReadAllLines(merged)); // the comment lines too, shrinkage note included
        // Shrinkage changes the rows, so the equality above is about the shrunk values.
        Assert.True(CliRunner.Run(["batch", .. options[..^2], "--out", none]).Exit == 0);
        Assert.NotEqual(Rows(all), Rows(none));
    }

    [Fact]
    public void ReferencesWithAndWithoutShrinkage_AreRefusedForTheOtherKindOfBatch()
    {
        var (table, metadata) = SmallGroupedTable();
        string plain = Path.Combine(_dir, "plain.json"), shrunk = Path.Combine(_dir, "shrunk.json"), cut = Path.Combine(_dir, "cut.json");
        string[] options = ["--expression", table, "--metadata", metadata, "--group-by", "group", "--per", "cell"];
        Assert.Equal(0, CliRunner.Run(["batch", .. options, "--write-references", plain]).Exit);
        Assert.Equal(0, CliRunner.Run(["batch", .. options, "--shrink", "group", "--write-references", shrunk]).Exit);

        var r = CliRunner.Run(["batch", .. options, "--shrink", "group", "--shard", "1/4", "--references", plain]);
        Assert.NotEqual(0, r.Exit);
        Assert.Contains("plain.json: made with settings", r.Err);
        Assert.Contains("(they differ in: shrink=none there, shrink=group here)", r.Err);
        var n = CliRunner.Run(["batch", .. options, "--shard", "1/4", "--references", shrunk]);
        Assert.NotEqual(0, n.Exit);
        Assert.Contains("shrunk.json: made with settings", n.Err);
        Assert.Contains("(they differ in: shrink=group there, shrink=none here)", n.Err);

        // A file whose priors section was cut out, or lacks one gene's priors, is refused naming the file and the gene.
        var o = System.Text.Json.Nodes.JsonNode.Parse(File.ReadAllText(shrunk))!.AsObject();
        var priors = o["shrinkage"]!["priors"]!.AsObject();
        string gene = priors.First().Key;
        priors.Remove(gene);
        File.WriteAllText(cut, o.ToJsonString());
        var g = CliRunner.Run(["batch", .. options, "--shrink", "group", "--shard", "1/4", "--references", cut]);
        Assert.NotEqual(0, g.Exit);
        Assert.Contains($"cut.json: no shrinkage prior for gene {gene}", g.Err);
        o.Remove("shrinkage");
        File.WriteAllText(cut, o.ToJsonString());
        var s = CliRunner.Run(["batch", .. options, "--shrink", "group", "--shard", "1/4", "--references", cut]);
        Assert.NotEqual(0, s.Exit);
        Assert.Contains("cut.json: holds no shrinkage priors", s.Err);
    }

    [Fact]
    public void ReferencesMadeWithOtherSettings_AreRefusedNamingTheFileAndTheDifference()
    {
        string table = SmallTable(), refs = Path.Combine(_dir, "refs.json");
        Assert.Equal(0, CliRunner.Run("batch", "--expression", table, "--per", "cell", "--write-references", refs).Exit);
        var r = CliRunner.Run("batch", "--expression", table, "--per", "cell", "--shard", "1/3", "--references", refs, "--exclude", "Scn1a");
        Assert.NotEqual(0, r.Exit);
        Assert.Contains("refs.json: made with settings", r.Err);
        Assert.Contains("(they differ in: exclude= there, exclude=Scn1a here)", r.Err);
        var g = CliRunner.Run("batch", "--expression", table, "--per", "group", "--references", refs);
        Assert.Contains("--references: only with --per cell", g.Err);
    }

    [Fact]
    public void H5adWithLogX_NamesTheCountsLayer_AndMatrixChoosesIt()
    {
        // X holds ln(1 + counts) (the common single-cell transform, common practice), layers/counts the counts.
        string[] cells = ["c1", "c2", "c3"], genes = ["Scn1a", "Kcnc1", "Kcna1", "Gapdh", "Actb"];
        var counts = new float[,] { { 40, 20, 10, 300, 900 }, { 10, 30, 5, 250, 700 }, { 25, 5, 20, 400, 600 } };
        var logX = new float[3, 5];
        for (int c = 0; c < 3; c++)
            for (int g = 0; g < 5; g++) logX[c, g] = (float)Math.Log(1 + counts[c, g]);
        static H5Group Frame(string[] index) => new()
        {
            ["_index"] = index,
            Attributes = new() { ["_index"] = "_index", ["encoding-type"] = "dataframe", ["encoding-version"] = "0.2.0" },
        };
        var path = Path.Combine(_dir, "atlas.h5ad");
        new H5File { ["X"] = logX, ["layers"] = new H5Group { ["counts"] = counts }, ["obs"] = Frame(cells), ["var"] = Frame(genes) }.Write(path);
        var refused = CliRunner.Run("build", "--expression", path, "--cell", "c1");
        Assert.NotEqual(0, refused.Exit);
        Assert.Contains("atlas.h5ad: dataset /X: values look log-transformed", refused.Err);
        Assert.Contains("layers/counts holds whole numbers: use --matrix layer:counts", refused.Err);
        var built = CliRunner.Run("build", "--expression", path, "--cell", "c1", "--matrix", "layer:counts");
        Assert.True(built.Exit == 0, built.Err);
        Assert.Contains("matrix choice 'layer:counts'", built.Err);
        var bad = CliRunner.Run("build", "--expression", path, "--cell", "c1", "--matrix", "obsm");
        Assert.Contains("--matrix: 'obsm' is not X, layer:NAME", bad.Err);
    }
}
