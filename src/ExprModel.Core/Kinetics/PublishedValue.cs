namespace ExprModel.Core.Kinetics;

/// <summary>A value stated in the entry's source paper that the tests compare the entry against.</summary>
public sealed record PublishedValue
{
    /// <summary>"half-activation" (mV), "slope" (mV), or "tau-at" (ms at <see cref="AtMv"/>).</summary>
    public required string Quantity { get; init; }
    public required string Gate { get; init; }
    public required double Value { get; init; }
    public double AtMv { get; init; }
    public required double Tolerance { get; init; }
    public required string Where { get; init; }
}
