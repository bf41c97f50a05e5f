namespace ExprModel.Web.Hosting;

/// <summary>A request body that throws <see cref="UploadTooLargeException"/> as soon as more than its limit has been read.</summary>
public sealed class LimitedRequestBody(Stream inner, long limitBytes, string message) : Stream
{
    private long _read;

    public override int Read(byte[] buffer, int offset, int count) => Count(inner.Read(buffer, offset, count));

    public override int Read(Span<byte> buffer) => Count(inner.Read(buffer));

    public override async ValueTask<int> ReadAsync(Memory<byte> buffer, CancellationToken cancel = default) =>
        Count(await inner.ReadAsync(buffer, cancel).ConfigureAwait(false));

    public override Task<int> ReadAsync(byte[] buffer, int offset, int count, CancellationToken cancel) =>
        ReadAsync(buffer.AsMemory(offset, count), cancel).AsTask();

    private int Count(int n)
    {
        _read += n;
        if (_read > limitBytes) throw new UploadTooLargeException(message);
        return n;
    }

    public override bool CanRead => true;
    public override bool CanSeek => false;
    public override bool CanWrite => false;
    public override long Length => throw new NotSupportedException();
    public override long Position { get => _read; set => throw new NotSupportedException(); }
    public override void Flush() { }
    public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
    public override void SetLength(long value) => throw new NotSupportedException();
    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
}
