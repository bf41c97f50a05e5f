using ExprModel.Core.Perturbation;

namespace ExprModel.Core.Confrontation;

/// <summary>Fit targets taken from recorded values, with how each was made.</summary>
/// <param name="StepDurationMs">The recordings' step duration (ms) when every value came from sweeps of one duration: a fit
/// should measure the model with that step (compare like with like); null otherwise.</param>
public sealed record RecordedTargets(IReadOnlyList<FitTarget> Targets, IReadOnlyList<string> Notes, double? StepDurationMs = null);
