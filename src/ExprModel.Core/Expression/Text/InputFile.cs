using System.IO.Compression;

namespace ExprModel.Core.Expression.Text;

/// <summary>
/// Opens an input file as a byte stream, inflating gzip when the file starts with the gzip magic bytes (whatever its
/// name), and refusing to inflate past a byte budget so a small malicious file cannot expand without bound.
/// </summary>
internal static class InputFile
{
    /// <summary>gzip member header: ID1 ID2 (RFC 1952, section 2.3.1).</summary>
    private static readonly byte[] GzipMagic = [0x1f, 0x8b];

    /// <param name="meter">When given, counts the bytes read from the file (before inflation).</param>
    public static Stream Open(string path, long maxDecompressedBytes, ReadMeter? meter = null)
    {
        if (!File.Exists(path))
            throw new ExpressionFormatException($"{Path.GetFileName(path)}: file not found ({path}).");
        Stream raw = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16);
        if (meter is not null) raw = new MeteredStream(raw, meter);
        var head = new byte[2];
        int n = raw.ReadAtLeast(head, 2, throwOnEndOfStream: false);
        raw.Position = 0;
        if (n == 2 && head[0] == GzipMagic[0] && head[1] == GzipMagic[1])
            return new BoundedStream(new GZipStream(raw, CompressionMode.Decompress), path, maxDecompressedBytes);
        return raw;
    }

    public static bool StartsWith(string path, ReadOnlySpan<byte> magic)
    {
        using var fs = File.OpenRead(path);
        Span<byte> head = stackalloc byte[magic.Length];
        return fs.ReadAtLeast(head, magic.Length, throwOnEndOfStream: false) == magic.Length && head.SequenceEqual(magic);
    }
}
