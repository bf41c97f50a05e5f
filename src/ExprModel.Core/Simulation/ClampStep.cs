namespace ExprModel.Core.Simulation;

/// <summary>One command step of a voltage-clamp family, with each channel's current.</summary>
public sealed record ClampStep(double CommandMv, double[] TimeMs, IReadOnlyDictionary<string, double[]> CurrentsUaPerCm2)
{
    /// <summary>Per channel: current of largest magnitude after the step onset (uA/cm2).</summary>
    public required IReadOnlyDictionary<string, double> PeakUaPerCm2 { get; init; }
    /// <summary>Per channel: mean current over the last 5% of the step (uA/cm2).</summary>
    public required IReadOnlyDictionary<string, double> SteadyUaPerCm2 { get; init; }
    /// <summary>Per channel: largest conductance during the step (mS/cm2).</summary>
    public required IReadOnlyDictionary<string, double> PeakConductanceMsPerCm2 { get; init; }
}
