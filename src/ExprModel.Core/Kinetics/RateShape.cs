namespace ExprModel.Core.Kinetics;

/// <summary>The parametric shapes a published rate, steady state or time constant takes.</summary>
public enum RateShape
{
    /// <summary>A * exp((V - V0) / K).</summary>
    Exponential,
    /// <summary>A / (1 + exp((V - V0) / K)).</summary>
    Sigmoid,
    /// <summary>A * (V - V0) / (1 - exp(-(V - V0) / K)); limit A * K at V = V0.</summary>
    LinearOverExponential,
    /// <summary>Floor + (1 - Floor) * [1 / (1 + exp((V0 - V) / K))]^Exponent (a steady state).</summary>
    Boltzmann,
    /// <summary>A, independent of voltage.</summary>
    Constant,
    /// <summary>Base + A / (C1 * exp((V - V0) / K) + C2 * exp(-(V - V1) / K1)) (a time constant).</summary>
    Bell,
    /// <summary>Base + A * exp(-((V - V0) / K)^2) (a time constant).</summary>
    Gaussian,
    /// <summary>Base + A / (1 + exp((V - V0) / K)) (a time constant with a floor, e.g. Golomb et al. 2007).</summary>
    OffsetSigmoid,
    /// <summary>
    /// 1 / (A (V - V0) / (1 - exp(-(V - V0) / K)) + C1 (V - V1) / (1 - exp(-(V - V1) / K1))): a time constant written as
    /// 1 / (alpha + beta) beside a separately fitted steady state (e.g. the h gate of Mainen et al. 1995).
    /// </summary>
    InverseRateSum,
    /// <summary>
    /// Opening rate limited by voltage-dependent calcium binding: A / (1 + C1 exp(-V / K) / [Ca]), C1 in mM
    /// (Moczydlowski &amp; Latorre 1983, J Gen Physiol 82:511). Depends on intracellular calcium.
    /// </summary>
    CalciumBoundOpening,
    /// <summary>
    /// Closing rate slowed by voltage-dependent calcium binding: A / (1 + [Ca] / (C1 exp(-V / K))), C1 in mM
    /// (Moczydlowski &amp; Latorre 1983). Depends on intracellular calcium.
    /// </summary>
    CalciumBoundClosing,
}
