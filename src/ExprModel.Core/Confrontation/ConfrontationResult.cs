using ExprModel.Core.Mapping;

namespace ExprModel.Core.Confrontation;

/// <summary>Predicted against recorded read-outs: per cell, per group and across cells, with how the columns were matched.</summary>
public sealed class ConfrontationResult
{
    public required RecordedFeatures Recorded { get; init; }
    /// <summary>Whether each cell was predicted by its own model or its group's.</summary>
    public required ModelPer Per { get; init; }
    /// <summary>How per-cell expression was estimated (or why it was not shrunk); empty for group models.</summary>
    public required string ExpressionNote { get; init; }
    public required IReadOnlyList<CellComparison> Cells { get; init; }
    public required IReadOnlyList<GroupComparison> Groups { get; init; }
    /// <summary>One row per matched read-out, in read-out order.</summary>
    public required IReadOnlyList<ReadoutAgreement> Agreement { get; init; }
}
