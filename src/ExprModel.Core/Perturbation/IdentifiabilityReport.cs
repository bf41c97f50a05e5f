namespace ExprModel.Core.Perturbation;

/// <summary>
/// What the targets pin down. <see cref="SingularValues"/> of the scaled sensitivity matrix (targets x fitted channels,
/// d((predicted - recorded) / scale) / d ln(density)), largest first, with each direction described by its largest
/// channel components; <see cref="DataSdLn"/> is, per channel, the standard deviation of ln(density) that the data
/// alone allow at one scale of misfit (infinite when a direction the data do not see involves it).
/// </summary>
public sealed record IdentifiabilityReport(
    IReadOnlyList<string> Channels,
    IReadOnlyList<double> SingularValues,
    IReadOnlyList<string> Directions,
    IReadOnlyList<bool> DirectionPinned,
    IReadOnlyList<double> DataSdLn,
    IReadOnlyList<bool> Pinned,
    double PinnedWithinLn)
{
    public bool IsPinned(string channel) => Pinned[Channels.ToList().IndexOf(channel)];
}
