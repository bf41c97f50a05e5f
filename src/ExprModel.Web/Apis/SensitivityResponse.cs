namespace ExprModel.Web.Apis;

/// <summary>The matrix as heat-map data: <see cref="Values"/>[channel][read-out]; <see cref="Kinds"/> says which columns are log ratios.</summary>
public sealed record SensitivityResponse(IReadOnlyList<string> Channels, IReadOnlyList<string> Readouts, IReadOnlyList<string> EntryUnits,
    IReadOnlyList<string> Kinds,
    IReadOnlyList<string> Quantisation, double?[][] Values, double StepLn, IReadOnlyList<string> Notes, string Caution);
