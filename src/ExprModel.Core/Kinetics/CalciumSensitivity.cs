namespace ExprModel.Core.Kinetics;

/// <summary>
/// Calcium dependence of a calcium-gated subunit (Hill form): x_inf = ca^n / (ca^n + K^n). A negative Hill
/// coefficient writes calcium-dependent inactivation, x_inf = K^m / (K^m + ca^m) with m = -n (for m = 1 the factor
/// K / (K + ca) of the CA1 calcium-channel models). A time constant of zero, with the gate marked instantaneous,
/// makes the gate follow calcium at once.
/// </summary>
public sealed record CalciumSensitivity(double HalfActivationMm, double HillCoefficient, double TimeConstantMs)
{
    /// <summary>True when the gate opens as calcium rises (positive Hill coefficient), false for calcium-dependent inactivation.</summary>
    public bool RisesWithCalcium => HillCoefficient > 0;

    /// <summary>The steady state at intracellular calcium <paramref name="calciumMm"/> (mM).</summary>
    public double SteadyStateAt(double calciumMm)
    {
        double m = Math.Abs(HillCoefficient);
        double cm = Math.Pow(Math.Max(calciumMm, 0), m), km = Math.Pow(HalfActivationMm, m);
        return RisesWithCalcium ? cm / (cm + km) : km / (km + cm);
    }
}
