using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// The onset of sustained firing (the smallest step whose second half still holds repetitive firing), the rate there,
/// and the excitability class it gives: class 1 when firing starts at a low rate (continuous f-I onset), class 2 when
/// it starts at a rate well above zero (Hodgkin 1948 classes).
/// </summary>
public static class SustainedFiring
{
    /// <summary>A step response fires in a sustained way when the second half of the step holds two or more spikes.</summary>
    public static bool IsSustained(FiPoint response) => response.LateRateHz > 0;

    /// <summary>Class 1 when the rate at the onset of sustained firing is below <paramref name="classOneBelowHz"/>, else class 2.</summary>
    public static int ExcitabilityClass(double onsetRateHz, double classOneBelowHz) => onsetRateHz < classOneBelowHz ? 1 : 2;

    /// <summary>
    /// The onset bracket an f-I curve already gives (its last step without sustained firing and the first with), when
    /// every step from that first one on fires in a sustained way and some step below it does not; null otherwise.
    /// The curve's steps must have the length the onset is judged on.
    /// </summary>
    public static (double BelowUaPerCm2, double AboveUaPerCm2)? OnsetBracket(IReadOnlyList<FiPoint> curve)
    {
        int firstLate = curve.ToList().FindIndex(IsSustained);
        return firstLate > 0 && curve.Skip(firstLate).All(IsSustained) ? (curve[firstLate - 1].CurrentUaPerCm2, curve[firstLate].CurrentUaPerCm2) : null;
    }

    /// <summary>
    /// Searches the onset of sustained firing on <see cref="ReadoutSettings.ClassStepMs"/> steps from rheobase up to
    /// <see cref="ReadoutSettings.BlockSearchMultiple"/> x rheobase (<see cref="OnsetSearch"/>); a note says when there is none.
    /// When the class step equals the f-I step, the f-I curve already brackets the onset, and its points count as probes.
    /// Every point the search measures is kept: the onset is always one of them (or an f-I point), so its rate needs no
    /// run of its own.
    /// </summary>
    internal static (double? OnsetUaPerCm2, double? OnsetRateHz, int? ExcitabilityClass) Measure(CompiledCell cell, ReadoutSettings s, CellState rest,
        double rheobaseUaPerCm2, IReadOnlyList<FiPoint> fiCurve, List<string> notes, CancellationToken cancel)
    {
        var sim = s.Simulation;
        double rb = rheobaseUaPerCm2;
        bool sameStep = s.ClassStepMs == s.StepDurationMs;
        (double, double)? known = sameStep ? OnsetBracket(fiCurve) : null;
        var classPoints = new Dictionary<double, FiPoint>();
        if (sameStep) foreach (var p in fiCurve) classPoints[p.CurrentUaPerCm2] = p;
        var sustained = OnsetSearch.FindOnset(amps =>
        {
            var pts = FiCurve.Measure(cell, amps, s.ClassStepMs, rest, sim, cancel);
            foreach (var p in pts) classPoints[p.CurrentUaPerCm2] = p;
            return pts.Select(IsSustained).ToArray();
        }, rb, rb * s.BlockSearchMultiple, s.RheobaseAbsoluteToleranceUaPerCm2, s.ClassRelativeTolerance, cancel, known);
        if (sustained is null)
        {
            notes.Add($"No sustained firing for steps up to {rb * s.BlockSearchMultiple:G3} uA/cm2; class not defined.");
            return (null, null, null);
        }
        double onset = sustained.AtOrAboveUaPerCm2;
        var atOnset = classPoints.TryGetValue(onset, out var seen) ? seen : FiCurve.Measure(cell, [onset], s.ClassStepMs, rest, sim, cancel)[0];
        return (onset, atOnset.LateRateHz, ExcitabilityClass(atOnset.LateRateHz, s.ClassOneOnsetRateHz));
    }
}
