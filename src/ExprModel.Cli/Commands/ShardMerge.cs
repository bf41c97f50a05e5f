using System.Globalization;
using System.Text.RegularExpressions;
using ExprModel.Core.Export;

namespace ExprModel.Cli.Commands;

/// <summary>
/// Joins the shard files of <c>exprmodel batch --shard I/N</c> into the table one unsharded run writes, byte for byte:
/// the shard line of the comments becomes "shard 1/1", rows come in item order. Every file is checked before anything
/// is written: it must be whole (its last line ends with a line break and it holds exactly the rows of its item range,
/// so a file cut off by a killed task is refused, naming it), belong to the same run (source, options note, header,
/// shard count), and no shard may be missing or given twice; missing shards are named by index and expected file.
/// Rows are read again shard by shard when writing, so memory holds one shard, not the whole atlas.
/// </summary>
internal static partial class ShardMerge
{
    private sealed record Shard(string File, int Position, int Index, int Count, int Items, string Source, string Rest, string Header,
        IReadOnlyList<string> Comments, int CommentLine)
    {
        public long From => (long)Items * (Index - 1) / Count;
        public long To => (long)Items * Index / Count;
        public string Range => To > From ? $"items {From} to {To - 1}" : "no items";
    }

    /// <summary>Checks every file, then writes the merged table to <paramref name="output"/> (standard output when null).</summary>
    public static void Merge(IReadOnlyList<string> files, CliContext ctx, string? output)
    {
        var shards = Check(files);
        ctx.Emit(w => Write(shards, w), output);
    }

    /// <summary>Reads and checks every file; the shards in index order, or a <see cref="CliException"/> naming the first problem.</summary>
    private static IReadOnlyList<Shard> Check(IReadOnlyList<string> files)
    {
        if (files.Count == 0) throw new CliException("Give the shard files to merge.");
        var absent = files.Select((f, k) => (File: f, Position: k + 1)).Where(f => !File.Exists(f.File)).ToList();
        if (absent.Count == files.Count)
            throw new CliException($"None of the shard files exists: expected {string.Join(", ", files)}.");
        var byIndex = new SortedDictionary<int, Shard>();
        Shard? first = null;
        for (int k = 0; k < files.Count; k++)
        {
            if (!File.Exists(files[k])) continue;
            var s = Read(files[k], k + 1);
            first ??= s;
            if (s.Count != first.Count || s.Items != first.Items)
                throw new CliException($"{s.File}: line {s.CommentLine}: shard {s.Index}/{s.Count} of {s.Items} items, but {first.File} is shard " +
                    $"{first.Index}/{first.Count} of {first.Items} items: shards of different runs.");
            if (s.Source != first.Source || s.Rest != first.Rest)
                throw new CliException($"{s.File}: line {s.CommentLine}: source or options note differs from {first.File}'s: shards of different runs.");
            if (s.Header != first.Header) throw new CliException($"{s.File}: its header differs from the one of {first.File}.");
            if (byIndex.TryGetValue(s.Index, out var twin))
                throw new CliException($"{s.File}: shard {s.Index}/{s.Count} is given twice (also {twin.File}).");
            byIndex.Add(s.Index, s);
        }
        int n = first!.Count;
        var missing = Enumerable.Range(1, n).Where(i => !byIndex.ContainsKey(i)).ToList();
        if (missing.Count > 0) throw new CliException(MissingMessage(missing, n, files, absent.Select(a => a.File).ToList(), byIndex.Values));
        if (absent.Count > 0) throw new CliException($"{absent[0].File}: no such shard file.");
        return [.. byIndex.Values];
    }

    /// <summary>"shards 3 and 7 of 8 are missing: expected out/shard-3.csv, out/shard-7.csv (not found)."</summary>
    private static string MissingMessage(List<int> missing, int n, IReadOnlyList<string> files, List<string> absent, IEnumerable<Shard> present)
    {
        string which = missing.Count == 1 ? $"shard {missing[0]} of {n} is" : $"shards {List(missing)} of {n} are";
        // Files given in shard order (as the job-array scripts give them) name the file each missing shard was expected in.
        bool inOrder = files.Count == n && present.All(s => s.Position == s.Index);
        string expected = inOrder ? $"expected {string.Join(", ", missing.Take(20).Select(i => files[i - 1]))}{(missing.Count > 20 ? ", ..." : "")} (not found)"
            : absent.Count > 0 ? $"these files were not found: {string.Join(", ", absent.Take(20))}{(absent.Count > 20 ? ", ..." : "")}"
            : "no file given holds " + (missing.Count == 1 ? "it" : "them");
        return $"{which} missing: {expected}. Rerun {(missing.Count == 1 ? "that shard" : "those shards")} (batch --shard I/{n}) and merge again.";
    }

    private static string List(List<int> xs)
    {
        if (xs.Count > 20) return string.Join(", ", xs.Take(20)) + $", ... ({xs.Count} shards)";
        return xs.Count == 1 ? $"{xs[0]}" : $"{string.Join(", ", xs.Take(xs.Count - 1))} and {xs[^1]}";
    }

    private static Shard Read(string file, int position)
    {
        if (!EndsWithLineBreak(file))
            throw new CliException($"{file}: the last line has no line break: the file is cut off (a task killed while writing?). Rerun its shard.");
        var comments = new List<string>();
        Match? shardLine = null;
        int commentLine = 0, line = 0, rows = 0;
        string? header = null;
        long previous = -1;
        Shard? s = null;
        foreach (var raw in File.ReadLines(file))
        {
            line++;
            if (header is null)
            {
                if (raw.StartsWith('#'))
                {
                    comments.Add(raw);
                    if (ShardLine().Match(raw) is { Success: true } m) (shardLine, commentLine) = (m, line);
                    continue;
                }
                if (raw.Length == 0) continue;
                if (shardLine is null)
                    throw new CliException($"{file}: no comment line with 'shard I/N of M items' before the header: not a shard written by " +
                        "exprmodel batch.");
                header = raw;
                s = new Shard(file, position, Int(shardLine, "i"), Int(shardLine, "n"), Int(shardLine, "m"), shardLine.Groups["source"].Value,
                    shardLine.Groups["rest"].Value, header, comments, commentLine);
                if (s.Index < 1 || s.Index > s.Count) throw new CliException($"{file}: line {commentLine}: shard {s.Index}/{s.Count} is not a shard.");
                continue;
            }
            if (raw.Length == 0 || raw.StartsWith('#')) continue;
            var comma = raw.IndexOf(',');
            if (comma < 0 || !long.TryParse(raw.AsSpan(0, comma), NumberStyles.None, CultureInfo.InvariantCulture, out var idx))
                throw new CliException($"{file}: line {line}, column 1: '{raw.Split(',')[0]}' is not an item index.");
            if (idx < s!.From || idx >= s.To)
                throw new CliException($"{file}: line {line}: item {idx} lies outside shard {s.Index}/{s.Count} ({s.Range}).");
            if (idx <= previous) throw new CliException($"{file}: line {line}: item {idx} comes after item {previous}: rows out of order or repeated.");
            previous = idx;
            rows++;
        }
        if (s is null) throw new CliException($"{file}: no header line: the file is cut off or not a shard written by exprmodel batch.");
        if (rows != s.To - s.From)
            throw new CliException($"{file}: shard {s.Index}/{s.Count} holds {rows} of its {s.To - s.From} rows ({s.Range}): the file is incomplete. " +
                "Rerun its shard.");
        return s;
    }

    private static int Int(Match m, string group) =>
        int.TryParse(m.Groups[group].Value, NumberStyles.None, CultureInfo.InvariantCulture, out var v) ? v
            : throw new CliException($"shard line: '{m.Groups[group].Value}' is too large.");

    private static bool EndsWithLineBreak(string file)
    {
        using var f = File.OpenRead(file);
        if (f.Length == 0) return false;
        f.Seek(-1, SeekOrigin.End);
        return f.ReadByte() == '\n';
    }

    /// <summary>The first shard's comments with its shard line made "shard 1/1", the header, then every shard's rows (re-neutralised).</summary>
    private static void Write(IReadOnlyList<Shard> shards, TextWriter w)
    {
        var s1 = shards[0];
        foreach (var comment in s1.Comments)
        {
            var c = comment;
            if (ShardLine().Match(c) is { Success: true } m)
            {
                Group i = m.Groups["i"], n = m.Groups["n"];
                c = c[..i.Index] + "1/1" + c[(n.Index + n.Length)..];
            }
            w.Write(CsvTable.Comment(c.StartsWith("# ", StringComparison.Ordinal) ? c[2..] : c[1..]));
            w.Write('\n');
        }
        w.Write(CsvTable.Line(s1.Header));
        w.Write('\n');
        // Shards are files a user may have edited: every line goes back through the one neutralising writer.
        foreach (var s in shards)
        {
            bool inHeader = true;
            foreach (var raw in File.ReadLines(s.File))
            {
                if (raw.Length == 0 || raw.StartsWith('#')) continue;
                if (inHeader) { inHeader = false; continue; }
                w.Write(CsvTable.Line(raw));
                w.Write('\n');
            }
        }
    }

    // batch writes "# source: FILE; shard I/N of M items[; note]"; the greedy prefix takes the last shard part of a line
    // (a source name may hold "shard"), and a hand-edited shard may carry it on a comment line of its own.
    [GeneratedRegex(@"^#(?<source>.*)\bshard (?<i>\d+)/(?<n>\d+) of (?<m>\d+) items(?<rest>.*)$")]
    private static partial Regex ShardLine();
}
