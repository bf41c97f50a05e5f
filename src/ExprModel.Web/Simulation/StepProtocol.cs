namespace ExprModel.Web.Simulation;

/// <summary>The Workbench's current-clamp step: rest, one rectangular step, recovery. Amplitudes in uA/cm2.</summary>
public sealed record StepProtocol
{
    public double AmplitudeUaPerCm2 { get; init; } = 10;
    public double DelayMs { get; init; } = 100;
    public double StepMs { get; init; } = 500;
    public double AfterMs { get; init; } = 100;
    public double TotalMs => DelayMs + StepMs + AfterMs;
    /// <summary>Stochastic channels (counts from density x the cell's area / unitary conductance), seeded by <see cref="NoiseSeed"/>.</summary>
    public bool ChannelNoise { get; init; }
    public long NoiseSeed { get; init; } = 1;

    /// <summary>A problem naming the field, or null.</summary>
    public string? Problem()
    {
        if (!double.IsFinite(AmplitudeUaPerCm2)
            || Math.Abs(AmplitudeUaPerCm2) > 10_000) return "step.amplitudeUaPerCm2 must be a number between -10000 and 10000";
        if (!(DelayMs >= 0) || !(AfterMs >= 0) || !(StepMs > 0)) return "step: delayMs and afterMs must be >= 0 and stepMs > 0";
        if (TotalMs > 10_000) return $"step: the whole protocol may last at most 10000 ms (got {TotalMs} ms)";
        return null;
    }
}
