using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>Spike-frequency adaptation: how the inter-spike intervals lengthen through a step well above the onset of firing.</summary>
public static class Adaptation
{
    /// <summary>
    /// Adaptation ratio (last ISI / first ISI) and adaptation index, the mean over successive pairs of
    /// (ISI[n+1] - ISI[n]) / (ISI[n+1] + ISI[n]), from the spike times of one step response, recorded or simulated;
    /// both need at least three spikes (common practice).
    /// </summary>
    public static (double? Ratio, double? Index) FromSpikeTimes(IReadOnlyList<double> spikeTimesMs)
    {
        if (spikeTimesMs.Count < 3) return (null, null);
        var isi = new double[spikeTimesMs.Count - 1];
        for (int i = 0; i < isi.Length; i++) isi[i] = spikeTimesMs[i + 1] - spikeTimesMs[i];
        double sum = 0;
        for (int i = 0; i + 1 < isi.Length; i++) sum += (isi[i + 1] - isi[i]) / (isi[i + 1] + isi[i]);
        return (isi[^1] / isi[0], sum / (isi.Length - 1));
    }

    /// <summary>
    /// The step adaptation is read on: max(<see cref="ReadoutSettings.AdaptationStepMultiple"/> x rheobase, 1.2 x the
    /// onset of sustained firing, or 1.2 x rheobase without one).
    /// </summary>
    public static double StepUaPerCm2(double rheobaseUaPerCm2, double? sustainedOnsetUaPerCm2, ReadoutSettings s) =>
        Math.Max(s.AdaptationStepMultiple * rheobaseUaPerCm2, 1.2 * (sustainedOnsetUaPerCm2 ?? rheobaseUaPerCm2));

    /// <summary>
    /// Adaptation on the read-outs' step (<see cref="StepUaPerCm2"/>). The f-I curve already holds steps up to a multiple
    /// of rheobase: its first step at or above the target is used when it is within 10 % of it, and the target itself
    /// is simulated otherwise. A note says when there are fewer than three spikes.
    /// </summary>
    internal static (double StepUaPerCm2, double? Ratio, double? Index) Measure(CompiledCell cell, ReadoutSettings s, CellState rest,
        double rheobaseUaPerCm2, double? sustainedOnsetUaPerCm2, IReadOnlyList<FiPoint> fiCurve, List<string> notes, CancellationToken cancel)
    {
        double target = StepUaPerCm2(rheobaseUaPerCm2, sustainedOnsetUaPerCm2, s);
        var fromCurve = fiCurve.FirstOrDefault(p => p.CurrentUaPerCm2 >= target && p.CurrentUaPerCm2 <= 1.1 * target);
        var response = fromCurve ?? FiCurve.Measure(cell, [target], s.StepDurationMs, rest, s.Simulation, cancel)[0];
        var (ratio, index) = FromSpikeTimes(response.SpikeTimesMs);
        if (ratio is null) notes.Add($"Fewer than three spikes at {response.CurrentUaPerCm2:G3} uA/cm2; adaptation not defined.");
        return (response.CurrentUaPerCm2, ratio, index);
    }
}
