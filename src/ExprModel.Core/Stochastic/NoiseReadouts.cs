using ExprModel.Core.Simulation;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// Read-outs that exist only with channel noise, each over seeded trials (trial t uses seed + t, so results do not depend
/// on scheduling): the spontaneous firing rate at zero current, the jitter of the first spike on a step, and the firing
/// probability against pulse amplitude (the all-or-none threshold of the deterministic model becomes a curve).
/// Trials start after <see cref="SettleMs"/> at zero current, so the channels leave their initial stationary draw.
/// </summary>
public static class NoiseReadouts
{
    public const double SettleMs = 100;

    /// <summary>Spikes per second at zero current over <paramref name="durationMs"/> after settling, pooled over trials.</summary>
    public static double SpontaneousRateHz(CompiledCell cell, ChannelNoiseSettings settings, double durationMs, int trials = 1,
        CancellationToken cancel = default)
    {
        var counts = Trials(cell, settings, new NoCurrent(), SettleMs + durationMs, trials, cancel)
            .Select(t => t.SpikeTimesMs.Count(s => s >= SettleMs)).ToArray();
        return counts.Sum() / (trials * durationMs / 1000.0);
    }

    /// <summary>First-spike latency after the onset of a step of <paramref name="amplitudeUaPerCm2"/> over trials.</summary>
    public static SpikeJitter Jitter(CompiledCell cell, ChannelNoiseSettings settings, double amplitudeUaPerCm2, double stepMs, int trials,
        CancellationToken cancel = default)
    {
        var stim = new StepCurrent(SettleMs, stepMs, amplitudeUaPerCm2);
        var latencies = Trials(cell, settings, stim, SettleMs + stepMs, trials, cancel)
            .Select(t => t.SpikeTimesMs.FirstOrDefault(s => s >= SettleMs, double.NaN) - SettleMs).Where(double.IsFinite).ToArray();
        return new SpikeJitter(latencies, trials);
    }

    /// <summary>
    /// For each amplitude, the fraction of trials in which a pulse of <paramref name="pulseMs"/> evokes a spike within
    /// <paramref name="windowMs"/> of its onset.
    /// </summary>
    public static IReadOnlyList<FiringProbabilityPoint> FiringProbability(CompiledCell cell, ChannelNoiseSettings settings,
        IReadOnlyList<double> amplitudesUaPerCm2, double pulseMs, int trials, double windowMs = 20, CancellationToken cancel = default)
    {
        var points = new List<FiringProbabilityPoint>();
        for (int a = 0; a < amplitudesUaPerCm2.Count; a++)
        {
            var stim = new StepCurrent(SettleMs, pulseMs, amplitudesUaPerCm2[a]);
            var seeded = settings with { Seed = settings.Seed + 1_000_003L * (a + 1) };
            var runs = Trials(cell, seeded, stim, SettleMs + Math.Max(pulseMs, windowMs), trials, cancel);
            int fired = runs.Count(t => t.SpikeTimesMs.Any(s => s >= SettleMs && s < SettleMs + windowMs));
            points.Add(new FiringProbabilityPoint(amplitudesUaPerCm2[a], fired, trials));
        }
        return points;
    }

    private static NoisyTrace[] Trials(CompiledCell cell, ChannelNoiseSettings settings, Stimulus stimulus, double durationMs, int trials,
        CancellationToken cancel)
    {
        if (trials < 1 || trials > 100_000) throw new ArgumentOutOfRangeException(nameof(trials), $"trials must be 1 to 100000 (got {trials})");
        var result = new NoisyTrace[trials];
        var spikesOnly = settings with { RecordEvery = 0 };
        Parallel.For(0, trials, new ParallelOptions { CancellationToken = cancel },
            t => result[t] = ChannelNoise.Run(cell, stimulus, durationMs, spikesOnly with { Seed = settings.Seed + t }, cancel));
        return result;
    }
}
