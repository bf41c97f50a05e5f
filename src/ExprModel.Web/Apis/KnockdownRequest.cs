namespace ExprModel.Web.Apis;

/// <summary>Knock-down request: every channel (or, with <see cref="Genes"/>, every gene) at <see cref="Level"/> of its density or expression.</summary>
public sealed record KnockdownRequest : ModelRequest
{
    public double Level { get; init; }
    public bool Genes { get; init; }
    /// <summary>Only this read-out, ranked (which genes or entries set it).</summary>
    public string? Readout { get; init; }
}
