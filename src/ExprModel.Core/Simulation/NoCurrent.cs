namespace ExprModel.Core.Simulation;

/// <summary>No injected current.</summary>
public sealed record NoCurrent : Stimulus
{
    public override double DensityAt(double tMs) => 0;
}
