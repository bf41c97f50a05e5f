using System.Text;

namespace ExprModel.Cli;

/// <summary>
/// Writes a file so that readers see either the old file or the whole new one, never a part: the text goes to a
/// temporary file in the same directory (a rename is atomic only within one file system), is flushed to the disk, and
/// is then renamed over the target. A task killed while writing leaves at most a hidden temporary file, never a
/// half-written shard under the real name; a failed write removes its temporary file.
/// </summary>
internal static class AtomicFile
{
    /// <summary>Suffix of the temporary files (hidden, named after the target, the process and a random part).</summary>
    public const string TemporarySuffix = ".tmp";

    public static void WriteAllText(string path, string text) =>
        Write(path, s =>
        {
            var bytes = new UTF8Encoding(encoderShouldEmitUTF8Identifier: false).GetBytes(text);
            s.Write(bytes);
        });

    /// <summary>Runs <paramref name="write"/> on a temporary file beside <paramref name="path"/>, then renames it over the target.</summary>
    public static void Write(string path, Action<Stream> write)
    {
        var full = Path.GetFullPath(path);
        var dir = Path.GetDirectoryName(full) ?? throw new IOException($"{path}: no directory to write in.");
        // Process id and a random part: array tasks on different nodes of a shared file system may share a process id.
        var tmp = Path.Combine(dir, $".{Path.GetFileName(full)}.{Environment.ProcessId}.{Guid.NewGuid():N}{TemporarySuffix}");
        try
        {
            using (var s = new FileStream(tmp, FileMode.CreateNew, FileAccess.Write, FileShare.None))
            {
                write(s);
                s.Flush(flushToDisk: true);
            }
            File.Move(tmp, full, overwrite: true);
        }
        finally
        {
            if (File.Exists(tmp)) File.Delete(tmp);
        }
    }
}
