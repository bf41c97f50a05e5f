namespace ExprModel.Core.Mapping;

/// <summary>
/// The cell a model built from expression gets unless the user says otherwise: size, temperature and passive leak.
/// The density rule, the command line's options, the build API and the Map page all start from these values.
/// </summary>
public static class ModelDefaults
{
    /// <summary>Whole-cell capacitance (pF); 50 pF is a small cortical neuron (from memory).</summary>
    public const double CapacitancePf = 50;

    /// <summary>Temperature (C); 34 C is a common slice-recording temperature (common practice).</summary>
    public const double TemperatureC = 34;

    /// <summary>Conductance of the passive leak added to every built model (entry "leak"), mS/cm2.</summary>
    public const double LeakMsPerCm2 = 0.05;

    /// <summary>Reversal potential of that leak (mV); also the built model's initial voltage.</summary>
    public const double LeakReversalMv = -70;
}
