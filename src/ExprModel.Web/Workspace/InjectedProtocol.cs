namespace ExprModel.Web.Workspace;

/// <summary>
/// The protocol chosen in the Workbench's protocols area, as a share link stores it (inside <see cref="SnapshotProtocol"/>,
/// so older links without it still open): the kind, its settings by name in the units <see cref="ProtocolForms"/> gives,
/// and for an uploaded waveform its samples (uA/cm2).
/// </summary>
public sealed record InjectedProtocol
{
    /// <summary>One of <see cref="ProtocolForms.Kinds"/>.</summary>
    public string Kind { get; init; } = ProtocolForms.Pulse;
    public Dictionary<string, double> Values { get; init; } = [];
    public string? WaveformName { get; init; }
    public double[]? WaveformTimesMs { get; init; }
    public double[]? WaveformUaPerCm2 { get; init; }
}
