namespace ExprModel.Core.Perturbation;

/// <summary>The optimiser a fit uses (both from MathNet.Numerics).</summary>
public enum FitOptimiser
{
    /// <summary>Nelder-Mead simplex: derivative-free, so the piecewise-constant read-outs of grid searches do not mislead it.</summary>
    Simplex,
    /// <summary>Levenberg-Marquardt on the scaled residuals, with a Jacobian from finite differences that step across several grid points.</summary>
    LevenbergMarquardt,
}
