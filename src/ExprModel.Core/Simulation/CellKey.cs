namespace ExprModel.Core.Simulation;

/// <summary>
/// What a compiled cell simulates, as a dictionary key: its kinetics (by <see cref="CellKinetics.Id"/>) and its channel
/// densities (by value). Cells with equal keys give identical results; a cache of results keyed by it survives renames
/// and needs no serialisation of the model.
/// </summary>
public readonly struct CellKey(long kineticsId, double[] densitiesMsPerCm2) : IEquatable<CellKey>
{
    private readonly double[] _densities = densitiesMsPerCm2;

    public long KineticsId { get; } = kineticsId;

    public bool Equals(CellKey other) => KineticsId == other.KineticsId && _densities.AsSpan().SequenceEqual(other._densities);

    public override bool Equals(object? obj) => obj is CellKey k && Equals(k);

    public override int GetHashCode()
    {
        var h = new HashCode();
        h.Add(KineticsId);
        foreach (var d in _densities) h.Add(d);
        return h.ToHashCode();
    }

    public static bool operator ==(CellKey a, CellKey b) => a.Equals(b);
    public static bool operator !=(CellKey a, CellKey b) => !a.Equals(b);
}
