using System.Collections.Concurrent;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The process-wide store of gate rate tables (<see cref="RateTable"/>), bounded by the bytes it holds: when a new table
/// takes it past <see cref="BoundBytes"/>, the least recently used tables are dropped until it fits again. A table
/// depends only on the gate's kinetics, its voltage shift, its temperature factor and the step, not on density, so
/// models built from the same entries (a batch over an atlas) share one copy; a server that sees many temperatures or
/// shifted kinetics keeps only the most recently used. Dropping a table loses nothing: cells that hold it keep using
/// it, and the next cell that needs it builds the same numbers again (the build is deterministic).
/// </summary>
internal sealed class RateTableCache
{
    /// <summary>Default bound of the shared store: 256 MB, about 210 gate tables.</summary>
    public const long DefaultBoundBytes = 256L * 1024 * 1024;

    /// <summary>The store every <see cref="RateTable"/> uses unless given another (tests use their own).</summary>
    public static readonly RateTableCache Shared = new(DefaultBoundBytes);

    private sealed class Entry(double[] table, long bytes, long lastUse)
    {
        public readonly double[] Table = table;
        public readonly long Bytes = bytes;
        public long LastUse = lastUse;
    }

    private readonly ConcurrentDictionary<(Kinetics.GateSpec, double, double, double), Entry> _entries = new();
    private readonly Lock _evict = new();
    private long _clock;
    private long _heldBytes;
    private long _evictions;

    public RateTableCache(long boundBytes)
    {
        if (boundBytes <= 0) throw new ArgumentOutOfRangeException(nameof(boundBytes), $"the bound must be positive (got {boundBytes} bytes)");
        BoundBytes = boundBytes;
    }

    /// <summary>Most bytes the store keeps (one table larger than this is still kept, alone).</summary>
    public long BoundBytes { get; }

    /// <summary>Bytes held now: per table its [decay, drive] pairs and the SIMD kernel's quad table built from them.</summary>
    public long HeldBytes => Interlocked.Read(ref _heldBytes);

    /// <summary>Tables held now.</summary>
    public int Count => _entries.Count;

    /// <summary>Tables dropped to keep within the bound since the store was made.</summary>
    public long Evictions => Interlocked.Read(ref _evictions);

    /// <summary>
    /// Bytes a table of <paramref name="points"/> grid points costs: the pairs (2 doubles per point) and the quad table
    /// (4 per point) that <see cref="RateTable.QuadPointers"/> makes from them and keeps as long as the pairs live.
    /// </summary>
    public static long BytesPerTable(int points) => 6L * sizeof(double) * points;

    /// <summary>The table for gate <paramref name="g"/> of <paramref name="cell"/> at this step, built with <paramref name="build"/> when not held.</summary>
    public double[] GetOrBuild(CellKinetics cell, int g, double dtMs, int points, Func<double[]> build)
    {
        var key = (cell.Gates[g], cell.GateShiftMv[g], cell.GateTemperatureFactor[g], dtMs);
        if (_entries.TryGetValue(key, out var held))
        {
            Volatile.Write(ref held.LastUse, Interlocked.Increment(ref _clock));
            return held.Table;
        }
        var table = build();
        lock (_evict)
        {
            if (_entries.TryGetValue(key, out held))
            {
                held.LastUse = Interlocked.Increment(ref _clock);
                return held.Table;
            }
            var entry = new Entry(table, BytesPerTable(points), Interlocked.Increment(ref _clock));
            _entries[key] = entry;
            Interlocked.Add(ref _heldBytes, entry.Bytes);
            EvictOverBound(key);
            return table;
        }
    }

    /// <summary>Drops least recently used tables (never the one just added) until the held bytes fit the bound. Caller holds the lock.</summary>
    private void EvictOverBound((Kinetics.GateSpec, double, double, double) keep)
    {
        while (Interlocked.Read(ref _heldBytes) > BoundBytes && _entries.Count > 1)
        {
            (Kinetics.GateSpec, double, double, double)? oldest = null;
            long oldestUse = long.MaxValue;
            foreach (var (key, e) in _entries)
            {
                long use = Volatile.Read(ref e.LastUse);
                if (use < oldestUse && !key.Equals(keep)) (oldest, oldestUse) = (key, use);
            }
            if (oldest is not { } drop || !_entries.TryRemove(drop, out var removed)) return;
            Interlocked.Add(ref _heldBytes, -removed.Bytes);
            Interlocked.Increment(ref _evictions);
        }
    }
}
