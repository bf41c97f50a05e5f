using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>Result of the rheobase search (<see cref="Rheobase.Search"/>).</summary>
/// <param name="Bracket">The onset bracket (null: no spike up to the maximum).</param>
/// <param name="LatencyMs">First spike time (ms from step onset) at the rheobase step, as the search saw it.</param>
/// <param name="BeforeFirstSpike">Where a recorded run of the rheobase step can start, at least <see cref="Rheobase.ResumeMarginMs"/>
/// before its first spike (null when the sweep could not keep one).</param>
/// <param name="OutOfRangeFromUaPerCm2">The smallest probed step that drove the membrane out of the physical range
/// (|V| of 1000 mV or more: the model has no stable response there); such steps count as no spike. Null when none did.</param>
public sealed record RheobaseResult(OnsetBracket? Bracket, double? LatencyMs, ResumePoint? BeforeFirstSpike, double? OutOfRangeFromUaPerCm2 = null)
{
    /// <summary>No search was run (the cell fires without input).</summary>
    public static RheobaseResult None { get; } = new(null, null, null);
}
