namespace ExprModel.Core.Analysis;

/// <summary>Result of an onset search: the largest amplitude without and the smallest with the property.</summary>
public sealed record OnsetBracket(double BelowUaPerCm2, double AtOrAboveUaPerCm2, double ToleranceUaPerCm2)
{
    /// <summary>Rounds of parallel probes the search took (for cost reports; not part of the answer).</summary>
    public int Rounds { get; init; }

    /// <summary>
    /// When some probe failed at a larger amplitude than one that held (the property is not monotone here), the
    /// lowest amplitude seen to hold and the highest seen to fail above it; null when every probe agreed with a
    /// single onset. The answer is then the onset the search's probe path found (never above an amplitude seen to
    /// hold), and another path can find another.
    /// </summary>
    public (double HeldUaPerCm2, double FailedAboveUaPerCm2)? NotMonotone { get; init; }
}
