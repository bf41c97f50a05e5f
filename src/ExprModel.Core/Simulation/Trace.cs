namespace ExprModel.Core.Simulation;

/// <summary>A recorded current-clamp run: membrane potential, optional channel currents, stimulus and spikes.</summary>
public sealed class Trace
{
    public required double SampleIntervalMs { get; init; }
    public required double[] TimeMs { get; init; }
    public required double[] VoltageMv { get; init; }
    public required double[] StimulusUaPerCm2 { get; init; }
    /// <summary>Per channel id, membrane current density (uA/cm2, outward positive), when recorded.</summary>
    public IReadOnlyDictionary<string, double[]> ChannelCurrentsUaPerCm2 { get; init; } = new Dictionary<string, double[]>();
    public double[]? CalciumMm { get; init; }
    /// <summary>Shell sodium (mM) per sample, for cells with a sodium shell.</summary>
    public double[]? SodiumMm { get; init; }
    /// <summary>Gate states per recorded sample, sample-major (sample r, gate k at r * gate count + k), when recorded.</summary>
    public double[]? GateStates { get; init; }
    public required IReadOnlyList<double> SpikeTimesMs { get; init; }
    /// <summary>With <see cref="SimulationSettings.KeepResumePoints"/>: where the run can be taken up again, in time order.</summary>
    public IReadOnlyList<ResumePoint> ResumePoints { get; init; } = [];
    public required CellState FinalState { get; init; }
    public required double DurationMs { get; init; }
}
