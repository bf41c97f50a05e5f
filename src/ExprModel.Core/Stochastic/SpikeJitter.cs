namespace ExprModel.Core.Stochastic;

/// <summary>First-spike latencies (ms from step onset) over repeated trials of one step, their mean and standard deviation.</summary>
public sealed record SpikeJitter(IReadOnlyList<double> LatenciesMs, int Trials)
{
    public double MeanMs => LatenciesMs.Count == 0 ? double.NaN : LatenciesMs.Average();

    /// <summary>Sample standard deviation of the latencies (the spike-time jitter); NaN below two spikes.</summary>
    public double StandardDeviationMs
    {
        get
        {
            if (LatenciesMs.Count < 2) return double.NaN;
            double m = MeanMs;
            return Math.Sqrt(LatenciesMs.Sum(x => (x - m) * (x - m)) / (LatenciesMs.Count - 1));
        }
    }
}
