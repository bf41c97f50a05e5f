namespace ExprModel.Core.Stochastic;

/// <summary>
/// How a whole-cell run with channel noise is made: the unitary conductance of each channel of the cell (pS, in the
/// model's channel order), the seed, the step, how often V is recorded, and above which expected count a binomial draw
/// takes its normal approximation (<see cref="StochasticRandom.NextBinomial"/>; infinity = every draw exact), and from
/// how many channels a type is simulated by diffusion approximation instead of binomial channel-number tracking
/// (<see cref="ChannelNoiseMethod"/>).
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
    /// <summary>
    /// A channel type with at least this many channels takes the diffusion approximation (<see cref="ChannelNoiseMethod.Diffusion"/>);
    /// fewer, binomial channel-number tracking. <see cref="int.MaxValue"/> = tracking for every type; 1 = diffusion for every type.
    /// </summary>
    public int DiffusionFromChannels { get; init; } = DefaultDiffusionFromChannels;

    /// <summary>Default of <see cref="DiffusionFromChannels"/> (the accuracy check behind it is in the contributor guide).</summary>
    public const int DefaultDiffusionFromChannels = 500;

    /// <summary>The methods in words, for the comment lines of exports and the pages (names the threshold and the draws).</summary>
    public string MethodSummary
    {
        get
        {
            string tracking = $"channel-number tracking with binomial updates (exact draws up to an expected count of {ExactUpToMean:G3}, normal above)";
            return DiffusionFromChannels == int.MaxValue ? tracking + " for every channel type"
                : $"diffusion approximation (mean gates plus one Ornstein-Uhlenbeck process per eigenmode; Linaro, Storace & Giugliano 2011) " +
                  $"for channel types with at least {Math.Max(1, DiffusionFromChannels)} channels, {tracking} below";
        }
    }

    /// <summary>The method a channel type with <paramref name="channels"/> channels (and kinetic gates) takes.</summary>
    public ChannelNoiseMethod MethodFor(int channels) =>
        channels >= Math.Max(1, DiffusionFromChannels) ? ChannelNoiseMethod.Diffusion : ChannelNoiseMethod.BinomialTracking;
}
