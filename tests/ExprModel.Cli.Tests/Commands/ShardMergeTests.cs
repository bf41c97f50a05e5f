namespace ExprModel.Cli.Tests.Commands;

/// <summary>
/// Merging shard files written by hand in the batch's layout (no simulation): item ranges follow the batch's split,
/// items [M(I-1)/N, MI/N) for shard I of N (integer division), so 10 items in 4 shards are 0-1, 2-4, 5-6, 7-9.
/// </summary>
public class ShardMergeTests
{
    private const string Caution = "# Research tool. Predictions are hypotheses (test).";

    private static string NewDirectory()
    {
        var dir = Path.Combine(Path.GetTempPath(), $"merge-{Guid.NewGuid():N}", "run 'a' $x");
        Directory.CreateDirectory(dir);
        return dir;
    }

    private static string Shard(int index, int count, int items, string source = "t.csv")
    {
        long from = (long)items * (index - 1) / count, to = (long)items * index / count;
        var rows = Enumerable.Range((int)from, (int)(to - from)).Select(i => $"{i},cell{i},{i * 1.5}\n");
        return $"{Caution}\n# source: {source}; shard {index}/{count} of {items} items\nitem_index,item,rheobase_pa\n{string.Concat(rows)}";
    }

    private static List<string> WriteShards(string dir, int count, int items)
    {
        var files = new List<string>();
        for (int i = 1; i <= count; i++)
        {
            var f = Path.Combine(dir, $"shard-{i}-of-{count}.csv");
            File.WriteAllText(f, Shard(i, count, items));
            files.Add(f);
        }
        return files;
    }

    [Fact]
    public void ShardsMergeToTheTableOfOneUnshardedRun()
    {
        var dir = NewDirectory();
        var files = WriteShards(dir, 4, 10);
        var merged = Path.Combine(dir, "merged.csv");
        // Given out of order: the rows come in item order all the same.
        var (exit, _, err) = CliRunner.Run(["merge", "--out", merged, files[2], files[0], files[3], files[1]]);
        Assert.True(exit == 0, err);
        Assert.Equal(Shard(1, 1, 10), File.ReadAllText(merged));
        Assert.Equal([merged, .. files.Order()], Directory.GetFiles(dir).Order());
    }

    [Fact]
    public void MissingShardsAreNamedByIndexAndExpectedFile()
    {
        var dir = NewDirectory();
        var files = WriteShards(dir, 8, 20);
        File.Delete(files[2]);
        File.Delete(files[6]);
        var (exit, output, err) = CliRunner.Run(["merge", .. files]);
        Assert.Equal(1, exit);
        Assert.Equal("", output);
        Assert.Contains($"error: shards 3 and 7 of 8 are missing: expected {files[2]}, {files[6]} (not found).", err);
        // Given in another order, the files cannot be matched to shards: the indices are still named, and the absent files.
        var shuffled = CliRunner.Run(["merge", files[1], files[0], .. files.Skip(2)]);
        Assert.Contains($"shards 3 and 7 of 8 are missing: these files were not found: {files[2]}, {files[6]}.", shuffled.Err);
        // Shards simply not given.
        var few = CliRunner.Run("merge", files[0], files[1]);
        Assert.Contains("shards 3, 4, 5, 6, 7 and 8 of 8 are missing: no file given holds them.", few.Err);
    }

    [Fact]
    public void AFileCutOffMidLineIsRefusedAndNothingIsWritten()
    {
        var dir = NewDirectory();
        var files = WriteShards(dir, 4, 10);
        var merged = Path.Combine(dir, "merged.csv");
        File.WriteAllText(merged, "an earlier merge\n");
        var text = File.ReadAllText(files[1]);
        File.WriteAllText(files[1], text[..(text.Length - 4)]);
        var (exit, _, err) = CliRunner.Run(["merge", "--out", merged, .. files]);
        Assert.Equal(1, exit);
        Assert.Contains($"{files[1]}: the last line has no line break: the file is cut off", err);
        Assert.Equal("an earlier merge\n", File.ReadAllText(merged));
        Assert.Equal(5, Directory.GetFiles(dir).Length);
    }

    [Fact]
    public void AFileCutOffAtALineEndIsRefusedByItsRowCount()
    {
        var dir = NewDirectory();
        var files = WriteShards(dir, 4, 10);
        var lines = File.ReadAllLines(files[1]);
        File.WriteAllText(files[1], string.Join("\n", lines[..^1]) + "\n");
        var (exit, _, err) = CliRunner.Run(["merge", .. files]);
        Assert.Equal(1, exit);
        Assert.Contains($"{files[1]}: shard 2/4 holds 2 of its 3 rows (items 2 to 4): the file is incomplete.", err);
        // Cut before the header: not taken for an empty shard.
        File.WriteAllText(files[1], string.Join("\n", lines[..2]) + "\n");
        Assert.Contains($"{files[1]}: no header line", CliRunner.Run(["merge", .. files]).Err);
    }

    [Fact]
    public void ShardsOfDifferentRunsOrGivenTwiceAreRefused()
    {
        var dir = NewDirectory();
        var files = WriteShards(dir, 4, 10);
        var twice = CliRunner.Run(["merge", .. files, files[0]]);
        Assert.Contains($"{files[0]}: shard 1/4 is given twice (also {files[0]}).", twice.Err);
        File.WriteAllText(files[3], Shard(4, 4, 11));
        Assert.Contains("shards of different runs", CliRunner.Run(["merge", .. files]).Err);
        File.WriteAllText(files[3], Shard(4, 4, 10, source: "other.csv"));
        Assert.Contains($"{files[3]}: line 2: source or options note differs", CliRunner.Run(["merge", .. files]).Err);
        File.WriteAllText(files[3], "item_index,item,rheobase_pa\n7,a,1\n");
        Assert.Contains("not a shard written by exprmodel batch", CliRunner.Run(["merge", .. files]).Err);
    }
}
