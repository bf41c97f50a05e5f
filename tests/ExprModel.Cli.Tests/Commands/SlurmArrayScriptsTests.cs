using System.Diagnostics;
using ExprModel.Cli.Commands;

namespace ExprModel.Cli.Tests.Commands;

/// <summary>
/// The written scripts, read and also run by bash itself (the outside judge of the quoting): a stand-in program
/// prints the arguments it receives, and a stand-in sbatch records how it was called.
/// </summary>
[System.Runtime.Versioning.UnsupportedOSPlatform("windows")] // the scripts are for bash on Linux cluster nodes
public class SlurmArrayScriptsTests
{
    /// <summary>Options with everything a shell treats specially.</summary>
    private static readonly string[] Nasty =
        ["--expression", "my data/it's \"counts\" $HOME `id` \\n;.csv", "--per", "cell", "--exclude", "*", "--weight", "Scn1a=0.5 && rm -rf /"];

    private static string NewDirectory(string name = "run dir's $PATH")
    {
        var dir = Path.Combine(Path.GetTempPath(), $"slurm-{Guid.NewGuid():N}", name);
        Directory.CreateDirectory(dir);
        return dir;
    }

    /// <summary>A program that prints its working directory and then each argument, one per line.</summary>
    private static string EchoProgram(string dir)
    {
        var path = Path.Combine(dir, "fake exprmodel");
        File.WriteAllText(path, "#!/bin/bash\npwd\nfor a in \"$@\"; do printf '%s\\n' \"$a\"; done\n");
        File.SetUnixFileMode(path, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute);
        return path;
    }

    private static SlurmArrayScripts Scripts(string dir, string work, int shards = 4) => new()
    {
        Shards = shards,
        Directory = dir,
        WorkingDirectory = work,
        Executable = [EchoProgram(work)],
        BatchOptions = Nasty,
        Partition = "short",
        Account = "lab-42",
        TimeLimit = "1-02:00:00",
        MemoryPerTask = "2G",
        CpusPerTask = 2,
    };

    private static (int Exit, string Out, string Err) Bash(string script, IDictionary<string, string>? env = null, params string[] args)
    {
        var info = new ProcessStartInfo("bash") { RedirectStandardOutput = true, RedirectStandardError = true };
        info.ArgumentList.Add(script);
        foreach (var a in args) info.ArgumentList.Add(a);
        foreach (var (k, v) in env ?? new Dictionary<string, string>()) info.Environment[k] = v;
        using var p = Process.Start(info)!;
        var err = p.StandardError.ReadToEndAsync();
        var output = p.StandardOutput.ReadToEnd();
        p.WaitForExit();
        return (p.ExitCode, output, err.Result);
    }

    [Fact]
    public void TheArrayHasOneTaskPerShardAndTheResourceOptionsOnPlainSbatchLines()
    {
        var s = Scripts("/data/run1", NewDirectory());
        var lines = s.ArrayScript().Split('\n');
        var directives = lines.Where(l => l.StartsWith("#SBATCH ", StringComparison.Ordinal)).ToArray();
        Assert.Equal(["#SBATCH --job-name=exprmodel", "#SBATCH --array=1-4", "#SBATCH --partition=short", "#SBATCH --account=lab-42",
            "#SBATCH --time=1-02:00:00", "#SBATCH --mem=2G", "#SBATCH --cpus-per-task=2", "#SBATCH --ntasks=1"], directives);
        Assert.Equal("#!/bin/bash", lines[0]);
        Assert.Contains("export DOTNET_PROCESSOR_COUNT=2", lines);
        Assert.Contains(lines, l => l.Contains("--shard \"$((SLURM_ARRAY_TASK_ID))/4\"", StringComparison.Ordinal));
        var merge = s.MergeScript().Split('\n');
        Assert.Contains("#SBATCH --job-name=exprmodel-merge", merge);
        Assert.DoesNotContain(merge, l => l.StartsWith("#SBATCH --array", StringComparison.Ordinal) || l.StartsWith("#SBATCH --mem", StringComparison.Ordinal));
    }

    [Fact]
    public void ATaskRunsBatchWithTheUsersOptionsUnchangedAndItsOwnShard()
    {
        var dir = NewDirectory();
        var work = NewDirectory("work 'dir' \"x\"");
        var s = Scripts(dir, work, shards: 12);
        var script = Path.Combine(dir, "array.sh");
        File.WriteAllText(script, s.ArrayScript());
        var (exit, output, err) = Bash(script, new Dictionary<string, string> { ["SLURM_ARRAY_TASK_ID"] = "3" });
        Assert.True(exit == 0, err);
        var args = output.TrimEnd('\n').Split('\n');
        Assert.Equal(work, args[0]);
        Assert.Equal(["batch", .. Nasty, "--shard", "3/12", "--out", Path.Combine(dir, "shards", "shard-03-of-12.csv")], args[1..]);
        Assert.Equal(Path.Combine(dir, "shards", "shard-03-of-12.csv"), s.ShardFile(3));
        // An index outside the array is refused before batch runs.
        var outside = Bash(script, new Dictionary<string, string> { ["SLURM_ARRAY_TASK_ID"] = "13" });
        Assert.Equal(2, outside.Exit);
        Assert.Contains("array index 13 is outside 1-12", outside.Err);
    }

    [Fact]
    public void TheMergeJobJoinsEveryShardInShardOrder()
    {
        var dir = NewDirectory();
        var work = NewDirectory();
        var s = Scripts(dir, work, shards: 3);
        var script = Path.Combine(dir, "merge.sh");
        File.WriteAllText(script, s.MergeScript());
        var (exit, output, err) = Bash(script);
        Assert.True(exit == 0, err);
        Assert.Equal([work, "merge", "--out", Path.Combine(dir, "merged.csv"), s.ShardFile(1), s.ShardFile(2), s.ShardFile(3)],
            output.TrimEnd('\n').Split('\n'));
    }

    [Fact]
    public void SubmitPutsTheMergeAfterTheArrayAndCanRerunChosenTasks()
    {
        var dir = NewDirectory("out %x 'q'");
        var work = NewDirectory();
        var s = Scripts(dir, work);
        var submit = Path.Combine(dir, "submit.sh");
        File.WriteAllText(submit, s.SubmitScript());
        // A stand-in sbatch: records its arguments (one per line, a blank line between calls) and answers job ids 41, 42, ...
        var bin = Path.Combine(work, "bin");
        Directory.CreateDirectory(bin);
        var record = Path.Combine(work, "calls.txt");
        File.WriteAllText(Path.Combine(bin, "sbatch"), $"#!/bin/bash\nn=$(grep -c '^$' {SlurmArrayScripts.Quote(record)} 2>/dev/null || true)\n" +
            $"for a in \"$@\"; do printf '%s\\n' \"$a\" >> {SlurmArrayScripts.Quote(record)}; done\necho >> {SlurmArrayScripts.Quote(record)}\n" +
            "echo \"$((41 + ${n:-0}));cluster\"\n");
        File.SetUnixFileMode(Path.Combine(bin, "sbatch"), UnixFileMode.UserRead | UnixFileMode.UserExecute | UnixFileMode.UserWrite);
        var env = new Dictionary<string, string> { ["PATH"] = bin + ":" + Environment.GetEnvironmentVariable("PATH") };
        var (exit, output, err) = Bash(submit, env);
        Assert.True(exit == 0, err);
        Assert.Equal("array job 41 (tasks 1-4 of 4); merge job 42 (starts after the array succeeds)\n", output);
        var calls = File.ReadAllText(record).Split("\n\n", StringSplitOptions.RemoveEmptyEntries).Select(c => c.Split('\n')).ToArray();
        Assert.Equal(["--parsable", "--array=1-4", $"--chdir={dir}", $"--output={dir.Replace("%", "%%")}/logs/task-%a-job-%A.out",
            Path.Combine(dir, "array.sh")], calls[0]);
        Assert.Equal(["--parsable", "--dependency=afterok:41", $"--chdir={dir}", $"--output={dir.Replace("%", "%%")}/logs/merge-job-%j.out",
            Path.Combine(dir, "merge.sh")], calls[1]);
        Assert.True(Directory.Exists(Path.Combine(dir, "shards")) && Directory.Exists(Path.Combine(dir, "logs")));
        // A rerun of tasks 3 and 7 alone, with a new merge job after it.
        var rerun = Bash(submit, env, "3,7");
        Assert.True(rerun.Exit == 0, rerun.Err);
        Assert.Equal("array job 43 (tasks 3,7 of 4); merge job 44 (starts after the array succeeds)\n", rerun.Out);
        Assert.Contains("--array=3,7", File.ReadAllText(record));
        Assert.Contains("--dependency=afterok:43", File.ReadAllText(record));
    }

    /// <summary>A stand-in sbatch on PATH: records its arguments (one per line, a blank line between calls) and answers job ids 41, 42, ...</summary>
    private static (Dictionary<string, string> Env, string Record) FakeSbatch(string work)
    {
        var bin = Path.Combine(work, "bin");
        Directory.CreateDirectory(bin);
        var record = Path.Combine(work, "calls.txt");
        File.WriteAllText(Path.Combine(bin, "sbatch"), $"#!/bin/bash\nn=$(grep -c '^$' {SlurmArrayScripts.Quote(record)} 2>/dev/null || true)\n" +
            $"for a in \"$@\"; do printf '%s\\n' \"$a\" >> {SlurmArrayScripts.Quote(record)}; done\necho >> {SlurmArrayScripts.Quote(record)}\n" +
            "echo \"$((41 + ${n:-0}));cluster\"\n");
        File.SetUnixFileMode(Path.Combine(bin, "sbatch"), UnixFileMode.UserRead | UnixFileMode.UserExecute | UnixFileMode.UserWrite);
        return (new Dictionary<string, string> { ["PATH"] = bin + ":" + Environment.GetEnvironmentVariable("PATH") }, record);
    }

    private static string[][] Calls(string record) =>
        File.ReadAllText(record).Split("\n\n", StringSplitOptions.RemoveEmptyEntries).Select(c => c.Split('\n')).ToArray();

    [Fact]
    public void WithReferencesAFirstJobWritesThemAndEveryTaskReadsThem()
    {
        var dir = NewDirectory();
        var work = NewDirectory("work 'dir' \"x\"");
        var refs = Path.Combine(dir, SlurmArrayScripts.ReferencesJson);
        var s = Scripts(dir, work, shards: 12) with { ReferencesPath = refs, ReferencesMemory = "8G" };
        var array = Path.Combine(dir, "array.sh");
        File.WriteAllText(array, s.ArrayScript());
        var task = Bash(array, new Dictionary<string, string> { ["SLURM_ARRAY_TASK_ID"] = "3" });
        Assert.True(task.Exit == 0, task.Err);
        Assert.Equal(["batch", .. Nasty, "--references", refs, "--shard", "3/12", "--out", s.ShardFile(3)], task.Out.TrimEnd('\n').Split('\n')[1..]);

        var script = s.ReferencesScript();
        var directives = script.Split('\n').Where(l => l.StartsWith("#SBATCH ", StringComparison.Ordinal)).ToArray();
        Assert.Equal(["#SBATCH --job-name=exprmodel-references", "#SBATCH --partition=short", "#SBATCH --account=lab-42", "#SBATCH --time=1-02:00:00",
            "#SBATCH --mem=8G", "#SBATCH --cpus-per-task=2", "#SBATCH --ntasks=1"], directives);
        var references = Path.Combine(dir, "references.sh");
        File.WriteAllText(references, script);
        var once = Bash(references);
        Assert.True(once.Exit == 0, once.Err);
        Assert.Equal([work, "batch", .. Nasty, "--write-references", refs], once.Out.TrimEnd('\n').Split('\n'));
        // Without a memory of its own the references job takes the tasks'.
        Assert.Contains("#SBATCH --mem=2G\n", (s with { ReferencesMemory = null }).ReferencesScript());
    }

    [Fact]
    public void SubmitRunsTheReferencesJobFirstAndOnlyWhileItsFileIsMissing()
    {
        var dir = NewDirectory("out %x 'q'");
        var work = NewDirectory();
        var refs = Path.Combine(dir, SlurmArrayScripts.ReferencesJson);
        var s = Scripts(dir, work) with { ReferencesPath = refs };
        var submit = Path.Combine(dir, "submit.sh");
        File.WriteAllText(submit, s.SubmitScript());
        var (env, record) = FakeSbatch(work);
        var (exit, output, err) = Bash(submit, env);
        Assert.True(exit == 0, err);
        Assert.Equal("references job 41 (reads the whole table once and writes references.json; the array starts after it succeeds)\n" +
            "array job 42 (tasks 1-4 of 4); merge job 43 (starts after the array succeeds)\n", output);
        var calls = Calls(record);
        var logs = dir.Replace("%", "%%", StringComparison.Ordinal) + "/logs";
        Assert.Equal(["--parsable", $"--chdir={dir}", $"--output={logs}/references-job-%j.out", Path.Combine(dir, "references.sh")], calls[0]);
        Assert.Equal(["--parsable", "--dependency=afterok:41", "--array=1-4", $"--chdir={dir}", $"--output={logs}/task-%a-job-%A.out",
            Path.Combine(dir, "array.sh")], calls[1]);
        Assert.Equal(["--parsable", "--dependency=afterok:42", $"--chdir={dir}", $"--output={logs}/merge-job-%j.out", Path.Combine(dir, "merge.sh")], calls[2]);

        // The references job wrote its file (atomically): a rerun of tasks 3 and 7 reuses it and waits for nothing but itself.
        File.WriteAllText(refs, "{}");
        var rerun = Bash(submit, env, "3,7");
        Assert.True(rerun.Exit == 0, rerun.Err);
        Assert.Equal($"references: reusing {refs}\narray job 44 (tasks 3,7 of 4); merge job 45 (starts after the array succeeds)\n", rerun.Out);
        calls = Calls(record);
        Assert.Equal(5, calls.Length);
        Assert.Equal(["--parsable", "--array=3,7", $"--chdir={dir}", $"--output={logs}/task-%a-job-%A.out", Path.Combine(dir, "array.sh")], calls[3]);
    }

    [Theory]
    [InlineData("plain", "'plain'")]
    [InlineData("it's", "'it'\\''s'")]
    [InlineData("", "''")]
    public void QuotingIsPosixSingleQuotes(string word, string quoted) => Assert.Equal(quoted, SlurmArrayScripts.Quote(word));
}
