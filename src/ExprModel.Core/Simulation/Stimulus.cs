using System.Runtime.CompilerServices;

namespace ExprModel.Core.Simulation;

/// <summary>
/// An injected current as a function of time. Amplitudes are current densities (uA/cm2); convert absolute
/// currents with <see cref="Cell.Geometry.PicoampsToDensity"/>. Positive current depolarises.
/// </summary>
public abstract record Stimulus
{
    /// <summary>Current density (uA/cm2) at time <paramref name="tMs"/>.</summary>
    public abstract double DensityAt(double tMs);

    /// <summary>Samples the stimulus at the midpoint of each integration step (second-order with the staggered scheme).</summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public virtual double[] Sample(double dtMs, int steps)
    {
        var s = new double[steps];
        for (int i = 0; i < steps; i++) s[i] = DensityAt((i + 0.5) * dtMs);
        return s;
    }
}
