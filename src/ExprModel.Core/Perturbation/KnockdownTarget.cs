namespace ExprModel.Core.Perturbation;

/// <summary>One knock-down: its name (entry id or gene symbol), what it is, and the factor it puts on each channel's density.</summary>
public sealed record KnockdownTarget(string Name, KnockdownKind Kind, IReadOnlyList<double> Factors)
{
    /// <summary>Every channel of a model at <paramref name="level"/> of its density, one at a time.</summary>
    public static IReadOnlyList<KnockdownTarget> Channels(IReadOnlyList<string> channelLabels, double level) =>
        channelLabels.Select((label, k) => new KnockdownTarget(label, KnockdownKind.Channel,
            channelLabels.Select((_, j) => j == k ? level : 1.0).ToArray())).ToArray();
}
