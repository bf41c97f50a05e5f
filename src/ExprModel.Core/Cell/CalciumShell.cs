namespace ExprModel.Core.Cell;

/// <summary>
/// A thin submembrane calcium shell filled by calcium current and relaxing to rest (common practice). Only the
/// free fraction 1/(1 + BufferCapacity) of the entering calcium stays free (fast buffer approximation, Neher &amp;
/// Augustine 1992, J Physiol 450:273); a capacity of about 100 is typical of neuronal cytoplasm (from memory,
/// e.g. Helmchen et al. 1996, Biophys J 70:1069, reported 100-200 in dendrites).
/// </summary>
public sealed record CalciumShell
{
    public double DepthUm { get; init; } = 0.1;
    public double DecayMs { get; init; } = 80;
    public double RestMm { get; init; } = 5e-5;
    public double BufferCapacity { get; init; } = 100;
}
