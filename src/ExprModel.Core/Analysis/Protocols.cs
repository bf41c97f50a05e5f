using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>The standard current-clamp protocols a practitioner reaches for, as stimuli (densities in uA/cm2).</summary>
public static class Protocols
{
    /// <summary>Time at the holding current before a read-out step starts (ms), 100 ms by common practice.</summary>
    public const double BaselineMs = 100;

    /// <summary>A rectangular step, by default 1 s long after a 100 ms baseline (common practice).</summary>
    public static StepCurrent Step(double amplitudeUaPerCm2, double delayMs = BaselineMs, double durationMs = 1000) =>
        new(delayMs, durationMs, amplitudeUaPerCm2);

    /// <summary>A family of equally spaced steps from <paramref name="fromUaPerCm2"/> to <paramref name="toUaPerCm2"/> inclusive.</summary>
    public static IReadOnlyList<StepCurrent> StepFamily(double fromUaPerCm2, double toUaPerCm2, int count, double delayMs = 100, double durationMs = 1000)
    {
        if (count < 1) throw new ArgumentOutOfRangeException(nameof(count), "A step family needs at least one step.");
        return Enumerable.Range(0, count)
            .Select(i => Step(count == 1 ? fromUaPerCm2 : fromUaPerCm2 + (toUaPerCm2 - fromUaPerCm2) * i / (count - 1), delayMs, durationMs))
            .ToArray();
    }

    public static RampCurrent Ramp(double fromUaPerCm2, double toUaPerCm2, double durationMs, double delayMs = 100) =>
        new(delayMs, durationMs, fromUaPerCm2, toUaPerCm2);

    public static PulseTrain Pulses(double amplitudeUaPerCm2, int count, double widthMs, double frequencyHz, double delayMs = 100) =>
        new(delayMs, count, widthMs, 1000.0 / frequencyHz, amplitudeUaPerCm2);

    public static NoisyCurrent Noise(double meanUaPerCm2, double sdUaPerCm2, double correlationMs, double durationMs, int seed, double delayMs = 100) =>
        new(delayMs, durationMs, meanUaPerCm2, sdUaPerCm2, correlationMs, seed);
}
