namespace ExprModel.Core.Analysis;

/// <summary>One point of an f-I curve.</summary>
/// <param name="CurrentUaPerCm2">Step amplitude (uA/cm2).</param>
/// <param name="SpikesInStep">Spikes during the step.</param>
/// <param name="WholeStepRateHz">Spike count divided by step duration.</param>
/// <param name="FirstIsiRateHz">Inverse of the first inter-spike interval (0 with fewer than two spikes).</param>
/// <param name="LateRateHz">Rate over the second half of the step: (n - 1) / (last - first) of the spikes there, 0 with fewer than two.</param>
/// <param name="FirstSpikeLatencyMs">Time from step onset to the first spike (null if none).</param>
public sealed record FiPoint(double CurrentUaPerCm2, int SpikesInStep, double WholeStepRateHz, double FirstIsiRateHz, double LateRateHz,
    double? FirstSpikeLatencyMs)
{
    public IReadOnlyList<double> SpikeTimesMs { get; init; } = [];
}
