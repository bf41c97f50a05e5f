using System.IO.Compression;
using System.Text;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The first lines of an uploaded table as text, for the Load page's preview before the table is read for real
/// (gzip is opened; at most <see cref="MaxPreviewBytes"/> are decoded, so a huge or hostile file costs nothing here).
/// </summary>
public static class TablePreview
{
    public const int MaxPreviewBytes = 64 * 1024;

    public static IReadOnlyList<string> FirstLines(byte[] bytes, string fileName, int count = 8) =>
        FirstLines(new MemoryStream(bytes, writable: false), fileName, count);

    /// <summary>The first lines of a file received to disk (an archive entry, a Matrix Market matrix).</summary>
    public static IReadOnlyList<string> FirstLines(ReceivedFile file, int count = 8) =>
        FirstLines(new FileStream(file.Path, FileMode.Open, FileAccess.Read, FileShare.Read), file.Name, count);

    private static IReadOnlyList<string> FirstLines(Stream raw, string fileName, int count)
    {
        using var s = OpenInflated(raw);
        var buffer = new byte[MaxPreviewBytes];
        int n = 0;
        try
        {
            int r;
            while (n < buffer.Length && (r = s.Read(buffer, n, buffer.Length - n)) > 0) n += r;
        }
        catch (InvalidDataException)
        {
            throw new Simulation.UserInputException($"{fileName}: the gzip data is damaged or truncated.");
        }
        if (n == 0) throw new Simulation.UserInputException($"{fileName}: the file is empty.");
        int nul = Array.IndexOf(buffer, (byte)0, 0, n);
        if (nul >= 0)
            throw new Simulation.UserInputException($"{fileName}: byte {nul + 1} is a NUL byte; this is not a text table (CSV or TSV, optionally gzip).");
        var text = new UTF8Encoding(false, false).GetString(buffer, 0, n).TrimStart('\uFEFF');
        return text.Split('\n').Take(count).Select(l => l.TrimEnd('\r')).Select(l => l.Length > 400 ? l[..400] + " …" : l).ToArray();
    }

    private static Stream OpenInflated(Stream raw)
    {
        Span<byte> magic = stackalloc byte[2];
        int n = raw.ReadAtLeast(magic, 2, throwOnEndOfStream: false);
        raw.Position = 0;
        return n == 2 && magic[0] == 0x1f && magic[1] == 0x8b ? new GZipStream(raw, CompressionMode.Decompress) : raw;
    }
}
