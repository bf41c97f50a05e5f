namespace ExprModel.Core.Stochastic;

/// <summary>A whole-cell run with channel noise: recorded times and voltages, spike times, and the channel counts used.</summary>
public sealed record NoisyTrace(double[] TimeMs, double[] VoltageMv, IReadOnlyList<double> SpikeTimesMs, IReadOnlyList<int> ChannelCounts);
