using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// The one read-out extractor, used by every front end, the benchmarks and the tests alike. It runs each protocol on a
/// model cell from its settled rest and hands the responses to the measurement of its family:
/// <see cref="Rest"/>, <see cref="Passive"/>, <see cref="Sag"/>, <see cref="Rheobase"/>, <see cref="SpikeAtRheobase"/>,
/// <see cref="FiCurve"/>, <see cref="SustainedFiring"/>, <see cref="Adaptation"/> and <see cref="DepolarisationBlock"/>.
/// </summary>
public static class Features
{
    /// <summary>Every read-out: <see cref="MeasureFirst"/> and <see cref="Complete"/> in a row.</summary>
    public static CellReadouts Measure(CompiledCell cell, ReadoutSettings? settings = null, CancellationToken cancel = default) =>
        Complete(cell, MeasureFirst(cell, settings, cancel), settings, cancel);

    /// <summary>
    /// The first stage of the read-outs: rest, input resistance, time constant, rheobase and the spike at rheobase. Its
    /// result has <see cref="CellReadouts.IsComplete"/> false; <see cref="Complete"/> adds sag, the f-I curve and what
    /// depends on it. The first stage is the quick part, so a caller can show it while the second runs.
    /// </summary>
    /// <param name="hint">A similar cell's rheobase and slope conductance (its <see cref="CellReadouts.Hint"/>): the search starts
    /// near the rheobase it predicts for this cell (same answer, fewer rounds).</param>
    public static CellReadouts MeasureFirst(CompiledCell cell, ReadoutSettings? settings = null, CancellationToken cancel = default, RheobaseHint? hint = null)
    {
        var s = settings ?? ReadoutSettings.Default;
        var geometry = cell.Model.Geometry;
        var notes = new List<string>();

        var (rest, firesAtRest) = Rest.Settle(cell, s, notes, cancel);
        double gSlope = Rest.SlopeConductanceForSteps(cell, rest.VoltageMv, notes);
        // The small passive step starts from rest like the rheobase search and does not depend on it: it runs beside the
        // search (on its own thread unless the caller keeps the cores busy; same results either way).
        var passiveTask = firesAtRest ? null : Beside(() => Passive.MeasureStep(cell, s, rest, gSlope, cancel), cancel);
        (RheobaseResult Found, (double, double)? NotMonotone) search =
            firesAtRest ? (RheobaseResult.None, null) : Rheobase.Measure(cell, rest, gSlope, s, hint, notes, cancel);
        var found = search.Found;
        var (rin, tau, passiveNote) = passiveTask is null ? (null, null, null) : passiveTask.GetAwaiter().GetResult();
        if (passiveNote is not null) notes.Add(passiveNote);
        var (rheobase, shape, latency) = found.Bracket is { } bracket
            ? SpikeAtRheobase.Measure(cell, s, rest, bracket.AtOrAboveUaPerCm2, found, notes, cancel)
            : (null, null, null);
        return new CellReadouts
        {
            RestingPotentialMv = firesAtRest ? null : rest.VoltageMv,
            FiresAtRest = firesAtRest,
            InputResistanceMOhm = rin,
            MembraneTimeConstantMs = tau,
            RheobaseUaPerCm2 = rheobase,
            RheobasePa = rheobase is { } r ? CurrentUnits.FromDensity(r, CurrentUnit.Pa, geometry) : null,
            RheobaseToleranceUaPerCm2 = rheobase is null ? null : found.Bracket?.ToleranceUaPerCm2,
            ThresholdMv = shape?.ThresholdMv,
            PeakMv = shape?.PeakMv,
            AmplitudeMv = shape?.AmplitudeMv,
            HalfWidthMs = shape is { } sh && !double.IsNaN(sh.HalfWidthMs) ? sh.HalfWidthMs : null,
            AfterHyperpolarisationMv = shape?.AfterHyperpolarisationMv,
            MaxRiseMvPerMs = shape?.MaxRiseMvPerMs,
            FirstSpikeLatencyMs = latency,
            AreaUm2 = geometry.AreaUm2,
            Notes = notes,
            RestState = rest,
            SlopeConductanceMsPerCm2 = gSlope,
            SpikingNotMonotone = search.NotMonotone is not null,
            IsComplete = false,
        };
    }

    /// <summary>
    /// The second stage: sag, the f-I curve from 0 to a multiple of rheobase, its gain, the onset of sustained firing and
    /// the excitability class, adaptation and (when the settings ask) the depolarisation-block search, added to a first
    /// stage's result.
    /// </summary>
    public static CellReadouts Complete(CompiledCell cell, CellReadouts first, ReadoutSettings? settings = null, CancellationToken cancel = default)
    {
        if (first.IsComplete) return first;
        var s = settings ?? ReadoutSettings.Default;
        var rest = first.RestState ?? throw new ArgumentException("the first stage's result carries no rest state", nameof(first));
        var notes = first.Notes.ToList();
        IReadOnlyList<FiPoint> fi = [];
        IReadOnlyList<FiPoint> extra = [];
        double? gain = null, onset = null, onsetRate = null, adaptStep = null, adaptRatio = null, adaptIndex = null, block = null, blockLimit = null;
        int? cls = null;
        // Sag runs beside the f-I sweep (it starts from rest too).
        var sagTask = !first.FiresAtRest && s.IncludeSag && first.SlopeConductanceMsPerCm2 is { } gSlope
            ? Beside(() => Sag.Measure(cell, s, rest, gSlope, cancel), cancel) : null;
        if (first.RheobaseUaPerCm2 is { } rb)
        {
            (fi, extra) = FiCurve.MeasureToMultipleOfRheobase(cell, rb, s, rest, cancel);
            gain = FiCurve.Gain(fi);
            (onset, onsetRate, cls) = SustainedFiring.Measure(cell, s, rest, rb, fi, notes, cancel);
            (adaptStep, adaptRatio, adaptIndex) = Adaptation.Measure(cell, s, rest, rb, onset, fi, notes, cancel);
            blockLimit = DepolarisationBlock.SearchLimitUaPerCm2(rb, s);
            if (onset is { } oc && s.IncludeDepolarisationBlock) block = DepolarisationBlock.Find(cell, s, rest, oc, blockLimit.Value, cancel);
        }

        double? sag = sagTask is null ? null : sagTask.GetAwaiter().GetResult();
        return first with
        {
            SagRatio = sag,
            FiCurve = fi,
            FiGainHzPerUaPerCm2 = gain,
            FiGainHzPerNa = gain is { } g ? CurrentUnits.PerDensityToPerNanoamp(g, cell.Model.Geometry) : null,
            SustainedFiringOnsetUaPerCm2 = onset,
            OnsetRateHz = onsetRate,
            ExcitabilityClass = cls,
            AdaptationStepUaPerCm2 = adaptStep,
            AdaptationRatio = adaptRatio,
            AdaptationIndex = adaptIndex,
            DepolarisationBlockUaPerCm2 = block,
            BlockSearchLimitUaPerCm2 = blockLimit,
            Notes = notes,
            ExtraSteps = extra,
            IsComplete = true,
        };
    }

    /// <summary>
    /// A side run that does not depend on the main search: on a thread of its own while the search runs, or computed
    /// here and now when the caller keeps every core busy already (<see cref="Simulator.SpreadOverCores"/>).
    /// </summary>
    private static Task<T> Beside<T>(Func<T> run, CancellationToken cancel) =>
        Simulator.SpreadOverCores ? Task.Run(run, cancel) : Task.FromResult(run());
}
