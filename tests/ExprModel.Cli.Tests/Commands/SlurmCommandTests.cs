using ExprModel.Cli.Commands;
using ExprModel.Data.Catalog;

namespace ExprModel.Cli.Tests.Commands;

[System.Runtime.Versioning.UnsupportedOSPlatform("windows")] // the scripts are for bash on Linux cluster nodes
public class SlurmCommandTests
{
    private static string Demo(string file) => Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo", file);

    private static string NewDirectory() => Path.Combine(Path.GetTempPath(), $"slurm-cmd-{Guid.NewGuid():N}", "run 'one'");

    [Fact]
    public void WritesThreeExecutableScriptsWithTheBatchOptionsPassedThrough()
    {
        var dir = NewDirectory();
        var (exit, _, err) = CliRunner.Run("slurm-array", "--shards", "8", "--dir", dir, "--partition", "gpu,cpu", "--time", "90", "--memory", "1500M",
            "--executable", "/opt/exprmodel/exprmodel", "--", "--expression", Demo("counts.csv"), "--per", "cell", "--shrink", "group", "--exclude", "Scn1a");
        Assert.True(exit == 0, err);
        foreach (var f in new[] { "array.sh", "merge.sh", "submit.sh" })
        {
            var path = Path.Combine(dir, f);
            Assert.True(File.Exists(path), f);
            Assert.True(File.GetUnixFileMode(path).HasFlag(UnixFileMode.UserExecute), f);
        }
        var array = File.ReadAllText(Path.Combine(dir, "array.sh"));
        Assert.Contains("#SBATCH --array=1-8\n", array);
        Assert.Contains("#SBATCH --partition=gpu,cpu\n", array);
        Assert.Contains("#SBATCH --time=90\n", array);
        Assert.Contains("#SBATCH --mem=1500M\n", array);
        Assert.Contains("#SBATCH --cpus-per-task=1\n", array);
        Assert.Contains($"exec '/opt/exprmodel/exprmodel' 'batch' '--expression' '{Demo("counts.csv")}' '--per' 'cell' '--shrink' 'group' " +
            $"'--exclude' 'Scn1a' '--references' {SlurmArrayScripts.Quote(Path.Combine(dir, "references.json"))} --shard \"$((SLURM_ARRAY_TASK_ID))/8\"",
            array);
        Assert.Contains("bash '", err);
        Assert.Contains("submit.sh'", err);
    }

    [Fact]
    public void APerCellBatchGetsAReferencesJobAndItsTasksReadOnlyTheirCells()
    {
        var dir = NewDirectory();
        var (exit, _, err) = CliRunner.Run("slurm-array", "--shards", "4", "--dir", dir, "--memory", "1G", "--references-memory", "3G",
            "--executable", "/opt/exprmodel/exprmodel", "--", "--expression", Demo("counts.csv"), "--per", "cell");
        Assert.True(exit == 0, err);
        // The run directory holds a quote, so the path is written quoted for bash.
        var refs = SlurmArrayScripts.Quote(Path.Combine(dir, "references.json"));
        var references = File.ReadAllText(Path.Combine(dir, "references.sh"));
        Assert.Contains("#SBATCH --mem=3G\n", references);
        Assert.Contains($"'batch' '--expression' '{Demo("counts.csv")}' '--per' 'cell' '--write-references' {refs}\n", references);
        Assert.True(File.GetUnixFileMode(Path.Combine(dir, "references.sh")).HasFlag(UnixFileMode.UserExecute));
        Assert.Contains($"'--per' 'cell' '--references' {refs} --shard", File.ReadAllText(Path.Combine(dir, "array.sh")));
        Assert.Contains("references.sh", File.ReadAllText(Path.Combine(dir, "submit.sh")));
    }

    [Fact]
    public void APerCellShrinkBatchGetsAReferencesJobThatAlsoFitsThePriors()
    {
        var dir = NewDirectory();
        var (exit, _, err) = CliRunner.Run("slurm-array", "--shards", "4", "--dir", dir, "--executable", "/opt/exprmodel/exprmodel", "--",
            "--expression", Demo("counts.csv"), "--metadata", Demo("metadata.csv"), "--group-by", "group", "--per", "cell", "--shrink", "group");
        Assert.True(exit == 0, err);
        var refs = SlurmArrayScripts.Quote(Path.Combine(dir, "references.json"));
        string options = $"'batch' '--expression' '{Demo("counts.csv")}' '--metadata' '{Demo("metadata.csv")}' '--group-by' 'group' '--per' 'cell' " +
            "'--shrink' 'group'";
        Assert.Contains($"{options} '--write-references' {refs}\n", File.ReadAllText(Path.Combine(dir, "references.sh")));
        Assert.Contains($"{options} '--references' {refs} --shard", File.ReadAllText(Path.Combine(dir, "array.sh")));
        Assert.Contains("references.sh", File.ReadAllText(Path.Combine(dir, "submit.sh")));
    }

    [Theory]
    [InlineData("--per", "group")] // a group's model needs every cell of the group
    [InlineData("--references", "mine.json")] // the user's own references are passed through as they are
    public void OtherBatchesReadTheWholeTableWithoutAReferencesJob(string option, string value)
    {
        var dir = NewDirectory();
        string[] per = option == "--per" ? [] : ["--per", "cell"];
        var (exit, _, err) = CliRunner.Run(["slurm-array", "--shards", "4", "--dir", dir, "--", "--expression", "x.csv", .. per, option, value]);
        Assert.True(exit == 0, err);
        Assert.False(File.Exists(Path.Combine(dir, "references.sh")));
        Assert.DoesNotContain("references.json", File.ReadAllText(Path.Combine(dir, "array.sh")));
        Assert.DoesNotContain("references", File.ReadAllText(Path.Combine(dir, "submit.sh")));
    }

    [Fact]
    public void WriteReferencesAmongTheBatchOptionsIsRefused()
    {
        var dir = NewDirectory();
        var (exit, _, err) = CliRunner.Run("slurm-array", "--shards", "2", "--dir", dir, "--", "--expression", "x.csv", "--per", "cell",
            "--write-references", "r.json");
        Assert.Equal(1, exit);
        Assert.Contains("--write-references is run by the references job", err);
        Assert.False(Directory.Exists(dir));
    }

    [Fact]
    public void TheRunningProgramIsTheDefault()
    {
        var exe = SlurmCommand.RunningExecutable();
        Assert.True(File.Exists(exe[0]), exe[0]);
        if (exe.Count == 2) Assert.EndsWith(".dll", exe[1]);
    }

    [Theory]
    [InlineData("--shard", "1/2", "--shard is set by each task itself")]
    [InlineData("--out", "x.csv", "--out is set by each task itself")]
    [InlineData("--per", "tissue", null)]
    [InlineData("--expresion", "x.csv", "batch options: ")]
    public void BatchOptionsAreCheckedByTheBatchCommand(string option, string value, string? expected)
    {
        var (exit, _, err) = CliRunner.Run("slurm-array", "--shards", "2", "--dir", NewDirectory(), "--", "--expression", "x.csv", option, value);
        if (expected is null)
        {
            // Values are checked by each task when it runs (the batch's own checks need the table); the option itself is known.
            Assert.True(exit == 0, err);
            return;
        }
        Assert.Equal(1, exit);
        Assert.Contains(expected, err);
    }

    [Fact]
    public void MissingBatchOptionsAreNamed()
    {
        var none = CliRunner.Run("slurm-array", "--shards", "2", "--dir", NewDirectory());
        Assert.Contains("Give the batch options after '--'", none.Err);
        var noTable = CliRunner.Run("slurm-array", "--shards", "2", "--dir", NewDirectory(), "--", "--per", "cell");
        Assert.Equal(1, noTable.Exit);
        Assert.Contains("batch options: ", noTable.Err);
        Assert.Contains("--expression", noTable.Err);
    }

    [Theory]
    [InlineData("--time", "2 hours", "--time '2 hours'")]
    [InlineData("--memory", "2GB", "--memory '2GB'")]
    [InlineData("--partition", "a b", "--partition 'a b'")]
    [InlineData("--account", "lab\n#SBATCH --qos=high", "--account '")]
    [InlineData("--shards", "0", "--shards: must be 1 to 1000000 (got 0)")]
    [InlineData("--cpus", "0", "--cpus: must be 1 or more (got 0)")]
    public void SchedulerOptionsAreCheckedBeforeAnythingIsWritten(string option, string value, string expected)
    {
        var dir = NewDirectory();
        string[] args = ["slurm-array", "--shards", "2", "--dir", dir, option, value, "--", "--expression", "x.csv"];
        if (option == "--shards") args = ["slurm-array", "--dir", dir, option, value, "--", "--expression", "x.csv"];
        var (exit, _, err) = CliRunner.Run(args);
        Assert.Equal(1, exit);
        Assert.Contains(expected, err);
        Assert.False(Directory.Exists(dir));
    }
}
