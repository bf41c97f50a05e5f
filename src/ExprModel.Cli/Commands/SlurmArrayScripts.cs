using System.Globalization;
using System.Text;

namespace ExprModel.Cli.Commands;

/// <summary>
/// The shell scripts of a SLURM job array for a sharded batch: <c>array.sh</c> (one task per shard, array indices
/// 1..N, each running <c>exprmodel batch ... --shard $((SLURM_ARRAY_TASK_ID))/N</c>), <c>merge.sh</c> (joins the N
/// shard files) and <c>submit.sh</c> (submits the array, or the tasks it is given, and the merge job with an
/// <c>afterok</c> dependency on it). Every path and forwarded option is single-quoted for the shell, so spaces, quotes
/// and dollar signs pass unchanged; only plain words reach the <c>#SBATCH</c> lines (sbatch does not parse shell
/// quoting there), and the paths for logs and working directories go on sbatch's command line in submit.sh instead.
/// With <see cref="ReferencesPath"/> set, a first job (<c>references.sh</c>) reads the whole table once and writes the
/// dataset references there (<c>batch --write-references</c>); the array waits for it (<c>afterok</c>) and each task
/// passes <c>--references</c>, so a task reads only its own cells. submit.sh submits that job only while the file is
/// missing, so a rerun of chosen tasks reuses the references already written.
/// </summary>
internal sealed record SlurmArrayScripts
{
    public required int Shards { get; init; }
    /// <summary>Absolute directory holding the scripts, <c>shards/</c>, <c>logs/</c> and the merged table.</summary>
    public required string Directory { get; init; }
    /// <summary>Absolute directory the tasks run in (relative paths among the batch options are relative to it).</summary>
    public required string WorkingDirectory { get; init; }
    /// <summary>The command that runs exprmodel: the program, and for a framework-dependent run, the dll after it.</summary>
    public required IReadOnlyList<string> Executable { get; init; }
    /// <summary>The user's batch options, passed through untouched (any batch option, present or future).</summary>
    public required IReadOnlyList<string> BatchOptions { get; init; }
    public string JobName { get; init; } = "exprmodel";
    public string? Partition { get; init; }
    public string? Account { get; init; }
    public string? TimeLimit { get; init; }
    public string? MemoryPerTask { get; init; }
    /// <summary>CPUs per task; also the processor count each task's runtime is told, the same on every node.</summary>
    public int CpusPerTask { get; init; } = 1;
    /// <summary>
    /// Where the references job writes the dataset references the tasks read (absolute), or null when the tasks read
    /// the whole table themselves (group models, or references the user passes among the batch options).
    /// </summary>
    public string? ReferencesPath { get; init; }
    /// <summary>Memory of the references job (it reads every cell); null takes <see cref="MemoryPerTask"/>.</summary>
    public string? ReferencesMemory { get; init; }

    public const string ArrayFile = "array.sh", MergeFile = "merge.sh", SubmitFile = "submit.sh", MergedFile = "merged.csv";
    public const string ReferencesFile = "references.sh", ReferencesJson = "references.json";

    /// <summary>Digits of the shard number in file names, so the shard files sort in shard order.</summary>
    private int Width => Shards.ToString(CultureInfo.InvariantCulture).Length;

    /// <summary>The shard file of task <paramref name="index"/>: shards/shard-03-of-12.csv.</summary>
    public string ShardFile(int index) =>
        Path.Combine(Directory, "shards", $"shard-{index.ToString("D" + Width, CultureInfo.InvariantCulture)}-of-{Shards}.csv");

    public string MergedPath => Path.Combine(Directory, MergedFile);

    /// <summary>Single-quotes a word for POSIX shells: inside single quotes nothing is special but the quote itself.</summary>
    public static string Quote(string word) => "'" + word.Replace("'", "'\\''", StringComparison.Ordinal) + "'";

    private string Command(IEnumerable<string> args) => string.Join(' ', Executable.Concat(args).Select(Quote));

    /// <param name="memory">The job's memory line, if any; a job that computes (array, references) also gets the CPU count.</param>
    private void Directives(StringBuilder sb, string name, bool array, string? memory = null, bool computes = false)
    {
        sb.Append("#!/bin/bash\n");
        sb.Append($"#SBATCH --job-name={name}\n");
        if (array) sb.Append($"#SBATCH --array=1-{Shards}\n");
        if (Partition is not null) sb.Append($"#SBATCH --partition={Partition}\n");
        if (Account is not null) sb.Append($"#SBATCH --account={Account}\n");
        if (TimeLimit is not null) sb.Append($"#SBATCH --time={TimeLimit}\n");
        if (memory is not null) sb.Append($"#SBATCH --mem={memory}\n");
        if (computes) sb.Append($"#SBATCH --cpus-per-task={CpusPerTask}\n");
        sb.Append("#SBATCH --ntasks=1\n");
    }

    public string ArrayScript()
    {
        var sb = new StringBuilder();
        Directives(sb, JobName, array: true, MemoryPerTask, computes: true);
        sb.Append($"# Written by exprmodel slurm-array. One task per shard: task I runs exprmodel batch --shard I/{Shards} and writes its\n");
        sb.Append("# shard file atomically (a task killed mid-run leaves no shard). Rerun a failed task alone with: bash submit.sh I\n");
        sb.Append("set -euo pipefail\n");
        sb.Append($"cd -- {Quote(WorkingDirectory)}\n");
        sb.Append("task=$((SLURM_ARRAY_TASK_ID))\n");
        sb.Append($"if [ \"$task\" -lt 1 ] || [ \"$task\" -gt {Shards} ]; then echo \"array index $task is outside 1-{Shards}\" >&2; exit 2; fi\n");
        // The runtime would otherwise see the whole node (no CPU binding without cgroups), and the onset searches probe
        // 4 amplitudes per processor and round: a cell whose spiking is not monotone in the amplitude can then get another
        // answer on a node of another size. One fixed count makes every task's rows the same on any node.
        sb.Append($"export DOTNET_PROCESSOR_COUNT={CpusPerTask}\n");
        sb.Append($"shard=$(printf '%s/shards/shard-%0{Width}d-of-{Shards}.csv' {Quote(Directory)} \"$task\")\n");
        string[] references = ReferencesPath is null ? [] : ["--references", ReferencesPath];
        sb.Append($"exec {Command(["batch", .. BatchOptions, .. references])} --shard \"$((SLURM_ARRAY_TASK_ID))/{Shards}\" --out \"$shard\"\n");
        return sb.ToString();
    }

    /// <summary>The first job: reads the whole table once and writes the dataset references the tasks read (atomically).</summary>
    public string ReferencesScript()
    {
        if (ReferencesPath is null) throw new InvalidOperationException("No references file: the tasks read the whole table.");
        var sb = new StringBuilder();
        Directives(sb, JobName + "-references", array: false, ReferencesMemory ?? MemoryPerTask, computes: true);
        sb.Append($"# Written by exprmodel slurm-array. Reads the whole table once and writes the dataset references ({ReferencesJson}) that\n");
        sb.Append("# every task reads, so a task reads only its own cells. submit.sh runs it only while the file is missing.\n");
        sb.Append("set -euo pipefail\n");
        sb.Append($"cd -- {Quote(WorkingDirectory)}\n");
        sb.Append($"export DOTNET_PROCESSOR_COUNT={CpusPerTask}\n");
        sb.Append($"exec {Command(["batch", .. BatchOptions, "--write-references", ReferencesPath])}\n");
        return sb.ToString();
    }

    public string MergeScript()
    {
        var sb = new StringBuilder();
        Directives(sb, JobName + "-merge", array: false);
        sb.Append($"# Written by exprmodel slurm-array. Joins the {Shards} shard files into {MergedFile}; names any missing or cut-off shard.\n");
        sb.Append("set -euo pipefail\n");
        sb.Append($"cd -- {Quote(WorkingDirectory)}\n");
        var files = Enumerable.Range(1, Shards).Select(ShardFile);
        sb.Append($"exec {Command(["merge", "--out", MergedPath, .. files])}\n");
        return sb.ToString();
    }

    public string SubmitScript()
    {
        var sb = new StringBuilder();
        sb.Append("#!/bin/bash\n");
        sb.Append("# Written by exprmodel slurm-array. Submits the job array and a merge job that starts when every task of it has\n");
        sb.Append("# succeeded (afterok). Give task indices to rerun only those (bash submit.sh 3 or bash submit.sh 3,7), e.g. after\n");
        sb.Append("# merge named them missing; the merge job then waits for the rerun and merges all shards again.\n");
        if (ReferencesPath is not null)
            sb.Append($"# First, while {ReferencesJson} is missing, the references job; the array waits for it (afterok).\n");
        sb.Append("set -euo pipefail\n");
        sb.Append($"tasks=\"${{1:-1-{Shards}}}\"\n");
        sb.Append($"dir={Quote(Directory)}\n");
        // sbatch expands % in --output paths: a literal % in the directory is written %%.
        sb.Append($"logs={Quote(Path.Combine(Directory, "logs").Replace("%", "%%", StringComparison.Ordinal))}\n");
        sb.Append("mkdir -p -- \"$dir/shards\" \"$dir/logs\"\n");
        string after = "";
        if (ReferencesPath is not null)
        {
            // Written atomically by the references job, so a file that exists is whole: reruns reuse it.
            sb.Append($"references={Quote(ReferencesPath)}\n");
            sb.Append("after=\"\"\n");
            sb.Append("if [ ! -s \"$references\" ]; then\n");
            sb.Append("  refs=$(sbatch --parsable --chdir=\"$dir\" --output=\"$logs/references-job-%j.out\" \"$dir/" + ReferencesFile + "\")\n");
            sb.Append("  refs=\"${refs%%;*}\"\n");
            sb.Append("  after=\"--dependency=afterok:$refs\"\n");
            sb.Append("  echo \"references job $refs (reads the whole table once and writes " + ReferencesJson + "; the array starts after it succeeds)\"\n");
            sb.Append("else\n");
            sb.Append("  echo \"references: reusing $references\"\n");
            sb.Append("fi\n");
            after = "${after:+\"$after\"} ";
        }
        sb.Append("array=$(sbatch --parsable " + after + "--array=\"$tasks\" --chdir=\"$dir\" --output=\"$logs/task-%a-job-%A.out\" " +
            "\"$dir/" + ArrayFile + "\")\n");
        sb.Append("array=\"${array%%;*}\"\n");
        sb.Append("merge=$(sbatch --parsable --dependency=\"afterok:$array\" --chdir=\"$dir\" --output=\"$logs/merge-job-%j.out\" " +
            "\"$dir/" + MergeFile + "\")\n");
        sb.Append("merge=\"${merge%%;*}\"\n");
        sb.Append("echo \"array job $array (tasks $tasks of " + Shards + "); merge job $merge (starts after the array succeeds)\"\n");
        return sb.ToString();
    }
}
