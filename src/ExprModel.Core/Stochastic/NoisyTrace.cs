namespace ExprModel.Core.Stochastic;

/// <summary>
/// A whole-cell run with channel noise: recorded times and voltages, spike times, the channel counts used and the method
/// each channel type took (in the model's channel order).
/// </summary>
public sealed record NoisyTrace(double[] TimeMs, double[] VoltageMv, IReadOnlyList<double> SpikeTimesMs, IReadOnlyList<int> ChannelCounts)
{
    public IReadOnlyList<ChannelNoiseMethod> Methods { get; init; } = [];
}
