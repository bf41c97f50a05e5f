using ExprModel.Core.Perturbation;

namespace ExprModel.Web.Apis;

public sealed record FitResponse(System.Text.Json.JsonElement Model, IReadOnlyList<FitChannelRow> Channels, IReadOnlyList<FitResidual> Residuals,
    IReadOnlyList<double> SingularValues, IReadOnlyList<string> Directions, IReadOnlyList<bool> DirectionPinned, double ObjectiveBefore, double ObjectiveAfter,
    int Evaluations, string Summary, string Caution)
{
    /// <summary>How targets taken from recorded values were made (empty for typed targets).</summary>
    public IReadOnlyList<string> TargetNotes { get; init; } = [];
}
