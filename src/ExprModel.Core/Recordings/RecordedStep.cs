namespace ExprModel.Core.Recordings;

/// <summary>
/// The current step of one sweep, found from its command current: onset and offset (ms from the sweep's first sample),
/// amplitude above the holding current (pA) and the holding current itself.
/// </summary>
/// <param name="EndsWithRecording">The current is still on at the last sample: the sweep stops before the step ends.</param>
public sealed record RecordedStep(double OnsetMs, double OffsetMs, double AmplitudePa, double HoldingPa, bool EndsWithRecording)
{
    public double DurationMs => OffsetMs - OnsetMs;

    /// <summary>
    /// Smallest departure from the holding current that counts as a step (pA): far below any step a protocol programs (the
    /// smallest model cells have rheobases of a few pA), far above the rounding of a stored command.
    /// </summary>
    public const double MinimumAmplitudePa = 0.01;

    /// <summary>
    /// Finds the step in a command current sampled every <paramref name="dtMs"/>: the holding current is the mean of the
    /// first 2 ms; the step spans the first to the last sample departing from it by more than half the largest
    /// departure; its amplitude is the mean over that span. Returns null with the reason when there is no step (a flat
    /// sweep) or the command is not a rectangular step (a ramp, a train: more than 2 % of the span further than 10 %
    /// of the amplitude from it).
    /// </summary>
    public static (RecordedStep? Step, string? Problem) Find(ReadOnlySpan<double> currentPa, double dtMs)
    {
        int n = currentPa.Length;
        if (n < 3) return (null, "fewer than three samples");
        int head = Math.Clamp((int)(2 / dtMs), 1, n);
        double holding = 0;
        for (int i = 0; i < head; i++) holding += currentPa[i];
        holding /= head;
        double largest = 0;
        for (int i = 0; i < n; i++) largest = Math.Max(largest, Math.Abs(currentPa[i] - holding));
        if (largest <= MinimumAmplitudePa) return (null, $"no step: the command current stays within {MinimumAmplitudePa} pA of {holding:0.###} pA");
        int first = -1, last = -1;
        for (int i = 0; i < n; i++)
            if (Math.Abs(currentPa[i] - holding) > largest / 2) { if (first < 0) first = i; last = i; }
        double sum = 0;
        for (int i = first; i <= last; i++) sum += currentPa[i];
        double amplitude = sum / (last - first + 1) - holding;
        int off = 0;
        double tolerance = 0.1 * Math.Abs(amplitude) + MinimumAmplitudePa;
        for (int i = first; i <= last; i++) if (Math.Abs(currentPa[i] - holding - amplitude) > tolerance) off++;
        if (off > 0.02 * (last - first + 1))
            return (null, $"not a rectangular step: {off} of the {last - first + 1} samples from {first * dtMs:0.###} to {(last + 1) * dtMs:0.###} ms depart " +
                "from their mean by more than 10 %");
        return (new RecordedStep(first * dtMs, (last + 1) * dtMs, amplitude, holding, last == n - 1), null);
    }
}
