namespace ExprModel.Core.Expression;

/// <summary>
/// Counts what a read touched: bytes taken from the file (for HDF5 files, what the library asked the file for; for
/// text, the bytes read from disk before any gzip inflation) and matrix values decoded or parsed. Tests use it to show
/// a ranged read stays within its own cells; it is safe to share between threads.
/// </summary>
public sealed class ReadMeter
{
    private long _bytes, _values;

    public long BytesRead => Interlocked.Read(ref _bytes);

    /// <summary>Matrix elements decoded (HDF5: data and index elements fetched; text: numbers parsed).</summary>
    public long ValuesRead => Interlocked.Read(ref _values);

    internal void AddBytes(long n) => Interlocked.Add(ref _bytes, n);
    internal void AddValues(long n) => Interlocked.Add(ref _values, n);
}
