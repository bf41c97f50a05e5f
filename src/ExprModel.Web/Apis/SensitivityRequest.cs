namespace ExprModel.Web.Apis;

public sealed record SensitivityRequest : ModelRequest
{
    /// <summary>Step in ln(density); default ln 1.2.</summary>
    public double? StepLn { get; init; }
}
