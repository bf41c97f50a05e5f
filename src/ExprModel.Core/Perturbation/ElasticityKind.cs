namespace ExprModel.Core.Perturbation;

/// <summary>How a read-out's response to a density is expressed.</summary>
public enum ElasticityKind
{
    /// <summary>d ln(read-out) / d ln(density): dimensionless, for read-outs that keep one sign (rheobase, input resistance).</summary>
    LogRatio,
    /// <summary>d(read-out) / d ln(density), in the read-out's own unit: for potentials and indices whose sign can cross zero.</summary>
    PerLogDensity,
    /// <summary>Not differentiable: a flag or a class.</summary>
    None,
}
