namespace ExprModel.Data.Demo;

/// <summary>One invented transcriptomic group of the demo survey, with the channel genes that set its firing.</summary>
/// <param name="Name">Group label as written in the metadata.</param>
/// <param name="Firing">The firing the channel complement is designed to give.</param>
/// <param name="ChannelCpm">Target expression of channel genes in this group, in counts per million.</param>
/// <param name="Recorded">Typical recorded read-outs of the group: resting potential mV, input resistance MOhm, rheobase pA, max firing rate Hz.</param>
public sealed record DemoGroup(string Name, string Firing, IReadOnlyDictionary<string, double> ChannelCpm,
    (double RestMv, double InputMOhm, double RheobasePa, double MaxRateHz) Recorded);
