namespace ExprModel.Core.Kinetics;

/// <summary>
/// Sodium dependence of a sodium-gated subunit (Hill form, as for calcium in <see cref="CalciumSensitivity"/>):
/// x_inf = na^n / (na^n + K^n), with na the shell's intracellular sodium (mM). A negative coefficient writes
/// inhibition by sodium, x_inf = K^m / (K^m + na^m) with m = -n. A time constant of zero, with the gate marked
/// instantaneous, makes the gate follow sodium at once (the sodium-activated potassium current of Compte et al. 2003,
/// J Neurophysiol 89:2707, is written that way).
/// </summary>
public sealed record SodiumSensitivity(double HalfActivationMm, double HillCoefficient, double TimeConstantMs)
{
    /// <summary>True when the gate opens as sodium rises (positive Hill coefficient).</summary>
    public bool RisesWithSodium => HillCoefficient > 0;

    /// <summary>The steady state at intracellular sodium <paramref name="sodiumMm"/> (mM).</summary>
    public double SteadyStateAt(double sodiumMm)
    {
        double m = Math.Abs(HillCoefficient);
        double nm = Math.Pow(Math.Max(sodiumMm, 0), m), km = Math.Pow(HalfActivationMm, m);
        return RisesWithSodium ? nm / (nm + km) : km / (km + nm);
    }
}
