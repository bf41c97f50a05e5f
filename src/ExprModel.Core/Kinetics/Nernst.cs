namespace ExprModel.Core.Kinetics;

/// <summary>Reversal and driving-force rules for ionic currents.</summary>
public static class Nernst
{
    /// <summary>RT/zF in mV at <paramref name="temperatureC"/>.</summary>
    public static double ThermalVoltageMv(double temperatureC, int valence) =>
        1000.0 * PhysicalConstants.GasConstant * (temperatureC + PhysicalConstants.ZeroCelsiusInKelvin) / (valence * PhysicalConstants.Faraday);

    /// <summary>E = (RT/zF) ln(c_out/c_in), in mV.</summary>
    public static double PotentialMv(double outsideMm, double insideMm, int valence, double temperatureC)
    {
        if (!(outsideMm > 0) || !(insideMm > 0))
            throw new ArgumentOutOfRangeException(nameof(outsideMm), "Concentrations must be positive to compute a Nernst potential.");
        return ThermalVoltageMv(temperatureC, valence) * Math.Log(outsideMm / insideMm);
    }

    /// <summary>
    /// Goldman-Hodgkin-Katz driving term (mV) for a divalent ion, scaled so that far below reversal its slope is 1 (gbar is then the chord conductance there):
    /// G(V) = V (c_in/c_out - exp(-zFV/RT)) / (1 - exp(-zFV/RT)). The GHK current equation (Goldman 1943;
    /// Hodgkin &amp; Katz 1949) multiplied by a constant; current = gbar * open fraction * G(V).
    /// </summary>
    public static double GhkDrivingMv(double vMv, double insideMm, double outsideMm, int valence, double temperatureC)
    {
        double vt = ThermalVoltageMv(temperatureC, valence);
        double u = vMv / vt;
        double e = Math.Exp(-u);
        // Removable singularity at V = 0: V / (1 - exp(-u)) -> vt (1 + u/2).
        double linear = Math.Abs(u) < 1e-6 ? vt * (1 + u / 2) : vMv / (1 - e);
        return linear * (insideMm / outsideMm - e);
    }
}
