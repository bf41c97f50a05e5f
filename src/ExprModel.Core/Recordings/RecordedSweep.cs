namespace ExprModel.Core.Recordings;

/// <summary>
/// One recorded current-clamp sweep: membrane potential (mV) and command current (pA) sampled every
/// <see cref="SampleIntervalMs"/>, its number in the family, the step found in its command current and where it was read
/// from (named in every message about it).
/// </summary>
public sealed record RecordedSweep
{
    public required int SweepNumber { get; init; }
    public required double SampleIntervalMs { get; init; }
    public required double[] VoltageMv { get; init; }
    /// <summary>Command current (pA), as long as <see cref="VoltageMv"/> (a stimulus recorded past an aborted response is cut to it).</summary>
    public required double[] CurrentPa { get; init; }
    /// <summary>Where the sweep came from: "file.nwb: /acquisition/name" or "file.csv, sweep 3".</summary>
    public required string Source { get; init; }
    /// <summary>The step of the command current, or null when there is none (see <see cref="StepProblem"/>).</summary>
    public RecordedStep? Step { get; init; }
    public string? StepProblem { get; init; }
    /// <summary>The command as programmed, when it runs longer than the response (the recording was aborted); null otherwise.</summary>
    public double[]? FullCommandPa { get; init; }

    /// <summary>Length of the programmed command (ms) when the response stops before it.</summary>
    public double? CommandDurationMs => FullCommandPa is { } c ? c.Length * SampleIntervalMs : null;

    public double DurationMs => VoltageMv.Length * SampleIntervalMs;
    public double SamplingRateHz => 1000 / SampleIntervalMs;

    /// <summary>A sweep with its step found from the command current.</summary>
    /// <param name="commandPa">The command current; when longer than the voltage (an aborted recording) it is kept whole in
    /// <see cref="FullCommandPa"/> and cut to the voltage's length, and the step is found on the whole command.</param>
    public static RecordedSweep Create(int sweepNumber, double sampleIntervalMs, double[] voltageMv, double[] commandPa, string source)
    {
        if (voltageMv.Length > commandPa.Length) throw new ArgumentException($"{source}: {voltageMv.Length} voltage samples but only {commandPa.Length} " +
            "command samples.");
        bool aborted = commandPa.Length > voltageMv.Length;
        var currentPa = aborted ? commandPa[..voltageMv.Length] : commandPa;
        var (step, problem) = RecordedStep.Find(commandPa, sampleIntervalMs);
        return new RecordedSweep
        {
            SweepNumber = sweepNumber,
            SampleIntervalMs = sampleIntervalMs,
            VoltageMv = voltageMv,
            CurrentPa = currentPa,
            Source = source,
            Step = step,
            StepProblem = problem,
            FullCommandPa = aborted ? commandPa : null,
        };
    }
}
