namespace ExprModel.Core.Recordings;

/// <summary>What an NWB file written by <see cref="NwbWriter"/> holds: one session, one or more cells, each with its sweeps.</summary>
public sealed record NwbSession
{
    public required string Identifier { get; init; }
    public string Description { get; init; } = "current-clamp step family";
    /// <summary>Session start; also written as the file's creation date so the same input gives the same bytes.</summary>
    public DateTimeOffset StartTime { get; init; } = new(2026, 1, 1, 9, 0, 0, TimeSpan.Zero);
    public required IReadOnlyList<RecordedCell> Cells { get; init; }
    /// <summary>
    /// Store voltage as 16-bit integers in steps of this many mV (as a 16-bit digitiser does; the conversion attribute
    /// carries the step), instead of float32. Null keeps float32.
    /// </summary>
    public double? VoltageResolutionMv { get; init; }
    /// <summary>Chunk and deflate-compress the data (a command current is mostly constant and shrinks to almost nothing).</summary>
    public bool Compress { get; init; }
}
