namespace ExprModel.Core.Perturbation;

/// <summary>One start of a multi-start fit: where it began (relative densities of the fitted channels), its final objective, and why it stopped.</summary>
public sealed record FitStart(int Index, IReadOnlyList<double> StartRelative, double Objective, string Exit);
