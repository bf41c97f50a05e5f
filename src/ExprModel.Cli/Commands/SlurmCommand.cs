using System.CommandLine;
using System.Diagnostics;
using System.Text.RegularExpressions;

namespace ExprModel.Cli.Commands;

/// <summary>
/// exprmodel slurm-array: writes (and with --submit, submits) a SLURM job array that runs a batch in N shards, one
/// task per shard, plus a merge job that waits for the whole array. The batch options come after "--" and are checked
/// by the batch command itself, so every batch option, including ones added later, passes through unchanged. A per-cell
/// batch (with or without shrinkage) gets a first job that writes the dataset references once (with --shrink group also
/// the priors fitted over every cell), so each task reads only its cells.
/// </summary>
public static partial class SlurmCommand
{
    public static Command Create(CliContext ctx)
    {
        var c = new Command("slurm-array",
            "Write a SLURM job array running a batch in N shards (one task each) and a merge job after it; batch options follow '--'. " +
            "Example: exprmodel slurm-array --shards 100 --dir run1 --time 2:00:00 -- --expression atlas.h5ad --per cell");
        var shards = new Option<int>("--shards") { Description = "Number of shards, one array task each (array indices 1..N).", Required = true };
        var dir = new Option<string>("--dir")
        {
            Description = "Directory for the scripts, shards/, logs/ and merged.csv (created; relative paths in the batch options stay relative " +
                "to the current directory).",
            Required = true,
        };
        var partition = new Option<string?>("--partition") { Description = "SLURM partition (queue) for every job." };
        var account = new Option<string?>("--account") { Description = "SLURM account charged for every job." };
        var time = new Option<string?>("--time") { Description = "Wall-time limit per task and for the merge: MM, HH:MM:SS, D-HH or D-HH:MM:SS." };
        var memory = new Option<string?>("--memory") { Description = "Memory per task, e.g. 2G or 1500M." };
        var cpus = new Option<int>("--cpus")
        {
            Description = "CPUs per task; each task's runtime is told to use exactly that many (DOTNET_PROCESSOR_COUNT), on any node.",
            DefaultValueFactory = _ => 1,
        };
        var name = new Option<string>("--job-name")
        {
            Description = "Name of the array job (the merge job adds -merge).",
            DefaultValueFactory = _ => "exprmodel",
        };
        var exe = new Option<string?>("--executable")
        {
            Description = "exprmodel program the tasks run (default: this one; a bare name is looked up on PATH).",
        };
        var referencesMemory = new Option<string?>("--references-memory")
        {
            Description = "Memory of the references job that reads the whole table once (per-cell batches; default: --memory).",
        };
        var submit = new Option<bool>("--submit") { Description = "Submit with sbatch after writing (runs submit.sh)." };
        var batch = new Argument<string[]>("batch-options") { Description = "Options of exprmodel batch, after '--'.", Arity = ArgumentArity.ZeroOrMore };
        foreach (var o in new Option[] { shards, dir, partition, account, time, memory, referencesMemory, cpus, name, exe, submit }) c.Options.Add(o);
        c.Arguments.Add(batch);
        c.SetAction(p =>
        {
            var forwarded = p.GetValue(batch) ?? [];
            bool ownReferences = CheckBatchOptions(forwarded);
            int n = p.GetValue(shards);
            if (n < 1 || n > 1_000_000) throw new CliException($"--shards: must be 1 to 1000000 (got {n}).");
            var directory = Path.GetFullPath(p.GetValue(dir)!);
            var scripts = new SlurmArrayScripts
            {
                Shards = n,
                Directory = directory,
                ReferencesPath = ownReferences && n > 1 ? Path.Combine(directory, SlurmArrayScripts.ReferencesJson) : null,
                ReferencesMemory = p.GetValue(referencesMemory) is { } rm ? (Memory().IsMatch(rm) ? rm
                    : throw new CliException($"--references-memory '{rm}': use a whole number with an optional unit K, M, G or T, e.g. 4G.")) : null,
                WorkingDirectory = Environment.CurrentDirectory,
                Executable = p.GetValue(exe) is { } e ? [e.Contains('/') ? Path.GetFullPath(e) : e] : RunningExecutable(),
                BatchOptions = forwarded,
                JobName = Word(p.GetValue(name)!, "--job-name"),
                Partition = p.GetValue(partition) is { } pa ? Word(pa, "--partition") : null,
                Account = p.GetValue(account) is { } ac ? Word(ac, "--account") : null,
                TimeLimit = p.GetValue(time) is { } t ? (TimeLimit().IsMatch(t) ? t
                    : throw new CliException($"--time '{t}': use MM, MM:SS, HH:MM:SS, D-HH, D-HH:MM or D-HH:MM:SS.")) : null,
                MemoryPerTask = p.GetValue(memory) is { } m ? (Memory().IsMatch(m) ? m
                    : throw new CliException($"--memory '{m}': use a whole number with an optional unit K, M, G or T (megabytes without), e.g. 2G.")) : null,
                CpusPerTask = p.GetValue(cpus) is var k && k >= 1 ? k : throw new CliException($"--cpus: must be 1 or more (got {p.GetValue(cpus)})."),
            };
            if (n > 1000) ctx.Error.WriteLine("note: SLURM's default MaxArraySize (1001) allows array indices up to 1000; a larger array needs a cluster " +
                "that raised it.");
            Write(scripts, ctx);
            if (p.GetValue(submit)) return Submit(scripts, ctx);
            ctx.Error.WriteLine($"submit with: bash {SlurmArrayScripts.Quote(Path.Combine(scripts.Directory, SlurmArrayScripts.SubmitFile))}");
            return 0;
        });
        return c;
    }

    /// <summary>Parses the forwarded options with the batch command itself, so its checks (and options added later) apply as they are.</summary>
    /// <returns>
    /// True when the scripts should write the dataset references first: a per-cell batch (the only kind
    /// <c>--references</c> serves; with --shrink group the references hold the priors) whose options do not already name a
    /// references file.
    /// </returns>
    internal static bool CheckBatchOptions(IReadOnlyList<string> forwarded)
    {
        if (forwarded.Count == 0) throw new CliException("Give the batch options after '--', e.g. -- --expression counts.csv --per cell.");
        foreach (var t in forwarded)
        {
            if (t == "--write-references" || t.StartsWith("--write-references=", StringComparison.Ordinal)
                || t.StartsWith("--write-references:", StringComparison.Ordinal))
                throw new CliException("batch options: --write-references is run by the references job the scripts add for a per-cell batch; leave it out.");
            foreach (var own in new[] { "--shard", "--out" })
                if (t == own || t.StartsWith(own + "=", StringComparison.Ordinal) || t.StartsWith(own + ":", StringComparison.Ordinal))
                    throw new CliException($"batch options: {own} is set by each task itself (shard I/N, shards/shard-I-of-N.csv); leave it out.");
        }
        var root = new RootCommand();
        root.Subcommands.Add(ExpressionCommands.Create(new CliContext(TextWriter.Null, TextWriter.Null)).First(x => x.Name == "batch"));
        var parse = root.Parse(["batch", .. forwarded]);
        if (parse.Errors.Count > 0) throw new CliException("batch options: " + string.Join(" ", parse.Errors.Select(e => e.Message)));
        return parse.GetValue<string>("--per") == "cell" && parse.GetValue<string?>("--references") is null;
    }

    /// <summary>The running exprmodel: the program itself, or "dotnet exprmodel.dll" when run through the dotnet host.</summary>
    internal static IReadOnlyList<string> RunningExecutable()
    {
        var process = Environment.ProcessPath ?? throw new CliException("The running program's path is unknown: give --executable.");
        var dll = typeof(SlurmCommand).Assembly.Location;
        return Path.GetFileNameWithoutExtension(process) == "dotnet" && dll.Length > 0 ? [process, dll] : [process];
    }

    private static string Word(string value, string option) => SbatchWord().IsMatch(value) ? value
        : throw new CliException($"{option} '{value}': use letters, digits and _ . , + - only (it goes into an #SBATCH line).");

    private static void Write(SlurmArrayScripts s, CliContext ctx)
    {
        System.IO.Directory.CreateDirectory(Path.Combine(s.Directory, "shards"));
        System.IO.Directory.CreateDirectory(Path.Combine(s.Directory, "logs"));
        var scripts = new List<(string File, string Text)>
        {
            (SlurmArrayScripts.ArrayFile, s.ArrayScript()), (SlurmArrayScripts.MergeFile, s.MergeScript()), (SlurmArrayScripts.SubmitFile, s.SubmitScript()),
        };
        if (s.ReferencesPath is { } refs)
        {
            scripts.Insert(0, (SlurmArrayScripts.ReferencesFile, s.ReferencesScript()));
            // References left by an earlier run may belong to other options: the new scripts write them again (submit.sh reuses them only on reruns).
            if (File.Exists(refs))
            {
                File.Delete(refs);
                ctx.Error.WriteLine($"removed {refs} of an earlier run: the references job writes it again for these options");
            }
        }
        foreach (var (file, text) in scripts)
        {
            var path = Path.Combine(s.Directory, file);
            AtomicFile.WriteAllText(path, text);
            if (!OperatingSystem.IsWindows())
                File.SetUnixFileMode(path, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute | UnixFileMode.GroupRead
                    | UnixFileMode.GroupExecute | UnixFileMode.OtherRead | UnixFileMode.OtherExecute);
            ctx.Error.WriteLine($"wrote {path}");
        }
        if (s.ReferencesPath is not null)
            ctx.Error.WriteLine($"a references job first reads the whole table once and writes {s.ReferencesPath}; each task then reads only its own cells");
        ctx.Error.WriteLine($"{s.Shards} tasks write {s.ShardFile(1)} ... {s.ShardFile(s.Shards)}; the merge job writes {s.MergedPath}");
    }

    private static int Submit(SlurmArrayScripts s, CliContext ctx)
    {
        var info = new ProcessStartInfo("bash") { RedirectStandardOutput = true, RedirectStandardError = true, WorkingDirectory = s.Directory };
        info.ArgumentList.Add(Path.Combine(s.Directory, SlurmArrayScripts.SubmitFile));
        Process proc;
        try
        {
            proc = Process.Start(info) ?? throw new CliException("bash could not be started to run submit.sh.");
        }
        catch (System.ComponentModel.Win32Exception e)
        {
            throw new CliException($"bash could not be started to run submit.sh ({e.Message}).");
        }
        using (proc)
        {
            var err = proc.StandardError.ReadToEndAsync();
            var output = proc.StandardOutput.ReadToEnd();
            proc.WaitForExit();
            ctx.Out.Write(output);
            ctx.Error.Write(err.Result);
            if (proc.ExitCode != 0)
                throw new CliException($"submitting failed (submit.sh exit {proc.ExitCode}); the scripts are in {s.Directory}: submit them where sbatch " +
                    "runs with bash submit.sh.");
        }
        return 0;
    }

    [GeneratedRegex(@"^[A-Za-z0-9_.,+-]+\z")]
    private static partial Regex SbatchWord();

    [GeneratedRegex(@"^(\d+|\d+:\d{1,2}|\d+:\d{1,2}:\d{1,2}|\d+-\d+|\d+-\d+:\d{1,2}|\d+-\d+:\d{1,2}:\d{1,2})\z")]
    private static partial Regex TimeLimit();

    [GeneratedRegex(@"^\d+[KMGTkmgt]?\z")]
    private static partial Regex Memory();
}
