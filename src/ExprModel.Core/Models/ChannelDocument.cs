namespace ExprModel.Core.Models;

/// <summary>One channel of a model file.</summary>
public sealed record ChannelDocument
{
    public required string Entry { get; init; }
    /// <summary>The pinned catalog version; absent means "latest", and saving pins it.</summary>
    public int? Version { get; init; }
    public required double DensityMsPerCm2 { get; init; }
    public double RelativeDensity { get; init; } = 1;
    public double? ReversalMv { get; init; }
    public double ShiftMv { get; init; }
    public double TauScale { get; init; } = 1;
}
