namespace ExprModel.Core.Expression.Text;

/// <summary>
/// Counts inflated bytes, turns decompression errors into <see cref="ExpressionFormatException"/> naming the file,
/// and at the end checks the gzip trailer: .NET's GZipStream ends quietly on a truncated file, which would otherwise
/// read as a shorter, valid-looking table.
/// </summary>
internal sealed class BoundedStream(Stream inner, string path, long maxBytes) : Stream
{
    private readonly string fileName = Path.GetFileName(path);
    private long _total;
    private bool _verified;

    public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

    public override int Read(Span<byte> buffer)
    {
        int n;
        try { n = inner.Read(buffer); }
        catch (InvalidDataException e)
        {
            throw new ExpressionFormatException($"{fileName}: byte {_total:N0} of the decompressed data: corrupt or truncated gzip data ({e.Message}).");
        }
        _total += n;
        if (n == 0 && buffer.Length > 0 && !_verified) { _verified = true; VerifyTrailer(); }
        if (_total > maxBytes)
            throw new ExpressionLimitException($"{fileName}: byte {_total:N0} of the decompressed data: " +
                $"inflates past the limit of {maxBytes:N0} bytes (a decompression bomb, or raise the limit).");
        return n;
    }

    /// <summary>
    /// A gzip member ends with ISIZE, the uncompressed length modulo 2^32 (RFC 1952, section 2.3.1). For a
    /// single-member file it must equal the bytes inflated; a truncated file ends in compressed data instead, which
    /// matches by chance with probability 2^-32. A file of several members (concatenated gzip) carries only the last
    /// member's length, so when another member header is present the check cannot apply and is skipped.
    /// </summary>
    private void VerifyTrailer()
    {
        using var fs = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16);
        if (fs.Length < 18) throw Truncated();
        fs.Seek(-4, SeekOrigin.End);
        Span<byte> isize = stackalloc byte[4];
        fs.ReadExactly(isize);
        if (System.Buffers.Binary.BinaryPrimitives.ReadUInt32LittleEndian(isize) == (uint)_total) return;
        fs.Position = 0;
        if (HasLaterMemberHeader(fs)) return;
        throw Truncated();
    }

    private ExpressionFormatException Truncated() =>
        new($"{fileName}: byte {_total:N0} of the decompressed data: the gzip data stop early (truncated file: the trailer's length does not match).");

    /// <summary>Looks for a second gzip member header: ID1 ID2, CM = 8 (deflate), reserved flag bits clear.</summary>
    private static bool HasLaterMemberHeader(FileStream fs)
    {
        var buffer = new byte[1 << 16];
        long offset = 0;
        int carry = 0;
        while (true)
        {
            int n = fs.Read(buffer, carry, buffer.Length - carry);
            if (n == 0) return false;
            int len = carry + n;
            for (int i = 0; i + 3 < len; i++)
                if (offset + i > 0 && buffer[i] == 0x1f && buffer[i + 1] == 0x8b && buffer[i + 2] == 8 && (buffer[i + 3] & 0xE0) == 0)
                    return true;
            carry = Math.Min(3, len);
            Array.Copy(buffer, len - carry, buffer, 0, carry);
            offset += len - carry;
        }
    }

    public override bool CanRead => true;
    public override bool CanSeek => false;
    public override bool CanWrite => false;
    public override long Length => throw new NotSupportedException();
    public override long Position { get => _total; set => throw new NotSupportedException(); }
    public override void Flush() { }
    public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
    public override void SetLength(long value) => throw new NotSupportedException();
    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
    protected override void Dispose(bool disposing) { if (disposing) inner.Dispose(); base.Dispose(disposing); }
}
