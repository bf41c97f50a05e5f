namespace ExprModel.Core.Perturbation;

/// <summary>Where a running fit stands: model evaluations so far, starts finished, and the best objective seen.</summary>
public sealed record FitProgress(int Evaluations, int StartsDone, int Starts, double BestObjective);
