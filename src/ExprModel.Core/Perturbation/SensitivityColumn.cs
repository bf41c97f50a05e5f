namespace ExprModel.Core.Perturbation;

/// <summary>
/// One read-out of a sensitivity matrix: its unit, how its sensitivities are expressed (<see cref="Kind"/>), how finely
/// the extractor resolves it, and for read-outs on a grid the smallest elasticity the differences can show.
/// </summary>
public sealed record SensitivityColumn(string Readout, string Unit, ElasticityKind Kind, string Quantisation, double? Resolution)
{
    /// <summary>The unit of the matrix entries: "d ln / d ln" or "unit / d ln(density)".</summary>
    public string EntryUnit => Kind == ElasticityKind.LogRatio ? "d ln(readout) / d ln(density)" : $"{Unit} per unit ln(density)";
}
