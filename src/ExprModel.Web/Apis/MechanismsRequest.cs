namespace ExprModel.Web.Apis;

/// <summary>A model, an optional step amplitude (uA/cm2; default twice the rheobase), test-pulse delay (ms) and format (json or csv).</summary>
public sealed record MechanismsRequest : ModelRequest
{
    public double? AmplitudeUaPerCm2 { get; init; }
    public double? ProbeDelayMs { get; init; }
    public string Format { get; init; } = "json";
}
