namespace ExprModel.Core.Stochastic;

/// <summary>
/// How a whole-cell run with channel noise is made: the unitary conductance of each channel of the cell (pS, in the
/// model's channel order), the seed, the step, how often V is recorded, and above which expected count a binomial draw
/// takes its normal approximation (<see cref="StochasticRandom.NextBinomial"/>; infinity = every draw exact).
/// </summary>
public sealed record ChannelNoiseSettings
{
    public required IReadOnlyList<double> UnitaryConductancesPs { get; init; }
    public long Seed { get; init; } = 1;
    public double DtMs { get; init; } = 0.025;
    /// <summary>Keep every Nth step's voltage (0 = spikes only).</summary>
    public int RecordEvery { get; init; } = 4;
    /// <summary>Binomial draws with an expected count (of the rarer outcome) up to this are exact; above, normal. Default 25.</summary>
    public double ExactUpToMean { get; init; } = 25;
}
