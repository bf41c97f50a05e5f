namespace ExprModel.Core.Analysis;

/// <summary>
/// What <see cref="AdaptationMechanisms.Measure"/> found on one model: the spikes of a suprathreshold step train, their
/// threshold and after-hyperpolarisation trends, each channel's inter-spike current across the train, and the effective
/// threshold probed after one spike and after the train against rest.
/// </summary>
public sealed record MechanismReport
{
    public required double StepUaPerCm2 { get; init; }
    public required double StepDurationMs { get; init; }
    public required double RestMv { get; init; }
    public required IReadOnlyList<string> ChannelLabels { get; init; }
    public required IReadOnlyList<TrainSpike> Spikes { get; init; }
    /// <summary>Last spike's threshold minus the first's (mV); null below two spikes.</summary>
    public double? ThresholdRiseMv { get; init; }
    /// <summary>Least-squares slope of threshold against spike number (mV per spike); null below three spikes.</summary>
    public double? ThresholdSlopeMvPerSpike { get; init; }
    /// <summary>Last inter-spike after-hyperpolarisation depth minus the first's (mV; positive = deepening).</summary>
    public double? AfterHyperpolarisationChangeMv { get; init; }
    /// <summary>Least-squares slope of after-hyperpolarisation depth against spike number (mV per spike).</summary>
    public double? AfterHyperpolarisationSlopeMvPerSpike { get; init; }
    /// <summary>Per channel (in <see cref="ChannelLabels"/> order): last ramp's mean current minus the first's (uA/cm2).</summary>
    public IReadOnlyList<double>? RampCurrentChangeUaPerCm2 { get; init; }
    /// <summary>The channel whose inter-spike current moved most in the outward (hyperpolarising) direction, if any did.</summary>
    public string? BuildingUpChannel { get; init; }
    public ThresholdProbe? AfterOneSpike { get; init; }
    public ThresholdProbe? AfterTrain { get; init; }
    /// <summary>
    /// The train's membrane potential every <see cref="TrainSampleMs"/> from time 0 (the step starts at
    /// <see cref="Protocols.BaselineMs"/>; for plots).
    /// </summary>
    public IReadOnlyList<double> TrainVoltageMv { get; init; } = [];
    public double TrainSampleMs { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];
}
