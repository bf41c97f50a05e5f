using ExprModel.Core.Models;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// A finished fit: the fitted model (a new document whose derivation records the fit), each channel's fold change and
/// identifiability, the residual read-outs, the objective before and after, the starts, and a one-sentence summary of
/// how far expression alone is from the recording.
/// </summary>
public sealed record FitResult(
    ModelDocument Document,
    IReadOnlyList<FitChannel> Channels,
    IReadOnlyList<FitResidual> Residuals,
    IdentifiabilityReport Identifiability,
    double ObjectiveBefore,
    double ObjectiveAfter,
    double MisfitBefore,
    double MisfitAfter,
    IReadOnlyList<FitStart> Starts,
    int Evaluations,
    FitSettings Settings,
    string Summary);
