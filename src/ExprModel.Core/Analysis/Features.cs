using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>Every standard read-out of a model cell (names are ours; definitions in DEVELOPERS.md, "Read-outs").</summary>
public sealed record CellReadouts
{
    public double? RestingPotentialMv { get; init; }
    public bool FiresAtRest { get; init; }
    public double? InputResistanceMOhm { get; init; }
    public double? MembraneTimeConstantMs { get; init; }
    public double? SagRatio { get; init; }
    public double? RheobaseUaPerCm2 { get; init; }
    public double? RheobasePa { get; init; }
    public double? RheobaseToleranceUaPerCm2 { get; init; }
    public double? ThresholdMv { get; init; }
    public double? PeakMv { get; init; }
    public double? AmplitudeMv { get; init; }
    public double? HalfWidthMs { get; init; }
    public double? AfterHyperpolarisationMv { get; init; }
    public double? MaxRiseMvPerMs { get; init; }
    public double? FirstSpikeLatencyMs { get; init; }
    public IReadOnlyList<FiPoint> FiCurve { get; init; } = [];
    /// <summary>Responses to <see cref="ReadoutSettings.ExtraStepsUaPerCm2"/>, in that order.</summary>
    public IReadOnlyList<FiPoint> ExtraSteps { get; init; } = [];
    public double? FiGainHzPerUaPerCm2 { get; init; }
    public double? FiGainHzPerNa { get; init; }
    public double? SustainedFiringOnsetUaPerCm2 { get; init; }
    public double? OnsetRateHz { get; init; }
    public int? ExcitabilityClass { get; init; }
    public double? AdaptationStepUaPerCm2 { get; init; }
    public double? AdaptationRatio { get; init; }
    public double? AdaptationIndex { get; init; }
    public double? DepolarisationBlockUaPerCm2 { get; init; }
    public double? BlockSearchLimitUaPerCm2 { get; init; }
    public double AreaUm2 { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];
    /// <summary>False for a first stage (<see cref="Features.MeasureFirst"/>): the f-I curve and what depends on it are still to come.</summary>
    public bool IsComplete { get; init; } = true;
    /// <summary>The settled state at zero current that every protocol starts from (kept for the second stage).</summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public CellState? RestState { get; init; }
    /// <summary>Steady-state slope conductance at rest (mS/cm2) that sized the passive steps (kept for the second stage).</summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public double? SlopeConductanceMsPerCm2 { get; init; }

    /// <summary>The rheobase search saw a step spike and a larger one not (the note says which); see <see cref="Hint"/>.</summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public bool SpikingNotMonotone { get; init; }

    /// <summary>
    /// What the rheobase search of a similar cell (the next slider position) can start from; null without a rheobase, and
    /// null when this cell's spiking is not monotone in the step amplitude: its neighbours are likely to have such a gap
    /// too, and a seeded search can then settle in another spiking window than an unseeded one (the measurement a share
    /// link stores). Measured on the demo cells, each channel's slider moved to 49 %, 95 % or 173 %: moves from the
    /// 6 cells with a gap gave 1 such disagreement in 126, moves from 40 other cells (every sixth) none in 1,056.
    /// </summary>
    [System.Text.Json.Serialization.JsonIgnore]
    public RheobaseHint? Hint => !SpikingNotMonotone && RheobaseUaPerCm2 is { } r && SlopeConductanceMsPerCm2 is { } g ? new RheobaseHint(r, g) : null;

    /// <summary>Names (as in <see cref="Rows"/>) of the read-outs that only the second stage (<see cref="Features.Complete"/>) measures.</summary>
    public static IReadOnlySet<string> SecondStageNames { get; } = new HashSet<string>(StringComparer.Ordinal)
    {
        "sag_ratio", "fi_gain", "fi_gain_absolute", "sustained_firing_onset", "onset_rate", "excitability_class", "adaptation_step", "adaptation_ratio",
        "adaptation_index", "depolarisation_block_onset",
    };

    /// <summary>Every scalar read-out as (name, unit, value) rows, in a fixed order, for tables and CSV.</summary>
    public IEnumerable<(string Name, string Unit, double? Value)> Rows()
    {
        yield return ("resting_potential", "mV", RestingPotentialMv);
        yield return ("fires_at_rest", "0/1", FiresAtRest ? 1 : 0);
        yield return ("input_resistance", "MOhm", InputResistanceMOhm);
        yield return ("membrane_time_constant", "ms", MembraneTimeConstantMs);
        yield return ("sag_ratio", "fraction", SagRatio);
        yield return ("rheobase", "uA/cm2", RheobaseUaPerCm2);
        yield return ("rheobase_absolute", "pA", RheobasePa);
        yield return ("spike_threshold", "mV", ThresholdMv);
        yield return ("spike_peak", "mV", PeakMv);
        yield return ("spike_amplitude", "mV", AmplitudeMv);
        yield return ("spike_half_width", "ms", HalfWidthMs);
        yield return ("after_hyperpolarisation", "mV", AfterHyperpolarisationMv);
        yield return ("max_rise_rate", "mV/ms", MaxRiseMvPerMs);
        yield return ("first_spike_latency", "ms", FirstSpikeLatencyMs);
        yield return ("fi_gain", "Hz per uA/cm2", FiGainHzPerUaPerCm2);
        yield return ("fi_gain_absolute", "Hz/nA", FiGainHzPerNa);
        yield return ("sustained_firing_onset", "uA/cm2", SustainedFiringOnsetUaPerCm2);
        yield return ("onset_rate", "Hz", OnsetRateHz);
        yield return ("excitability_class", "1 or 2", ExcitabilityClass);
        yield return ("adaptation_step", "uA/cm2", AdaptationStepUaPerCm2);
        yield return ("adaptation_ratio", "last/first ISI", AdaptationRatio);
        yield return ("adaptation_index", "mean normalised ISI change", AdaptationIndex);
        yield return ("depolarisation_block_onset", "uA/cm2", DepolarisationBlockUaPerCm2);
    }
}

/// <summary>
/// A cell's rheobase and steady-state slope conductance at rest, from which the rheobase of a similar cell is predicted
/// as rheobase x (its slope conductance / this one's): the current needed to reach threshold scales with the conductance
/// the step must charge against. The prediction only chooses where the search looks first; the answer never depends on
/// it. (Our heuristic; over 25-move slider walks on the demo groups it is off by a median of one 2 % grid step, against
/// two to three for the previous rheobase alone: `bench rounds`.)
/// </summary>
public sealed record RheobaseHint(double RheobaseUaPerCm2, double SlopeConductanceMsPerCm2)
{
    /// <summary>The predicted rheobase (uA/cm2) of a cell whose slope conductance at rest is <paramref name="slopeConductanceMsPerCm2"/>.</summary>
    public double PredictFor(double slopeConductanceMsPerCm2) =>
        SlopeConductanceMsPerCm2 > 0 && slopeConductanceMsPerCm2 > 0 ? RheobaseUaPerCm2 * slopeConductanceMsPerCm2 / SlopeConductanceMsPerCm2 : RheobaseUaPerCm2;
}

/// <summary>The one feature extractor, used by the CLI, the web app and the tests alike.</summary>
public static class Features
{
    public static CellReadouts Measure(CompiledCell cell, ReadoutSettings? settings = null, CancellationToken cancel = default) =>
        Complete(cell, MeasureFirst(cell, settings, cancel), settings, cancel);

    /// <summary>
    /// The first stage of the read-outs: rest, input resistance, time constant, rheobase and the spike at rheobase. Its
    /// result has <see cref="CellReadouts.IsComplete"/> false; <see cref="Complete"/> adds sag, the f-I curve and what
    /// depends on it.
    /// The Workbench shows this stage as soon as it is done.
    /// </summary>
    /// <param name="hint">A similar cell's rheobase and slope conductance (its <see cref="CellReadouts.Hint"/>): the search starts
    /// near the rheobase it predicts for this cell (same answer, fewer rounds).</param>
    public static CellReadouts MeasureFirst(CompiledCell cell, ReadoutSettings? settings = null, CancellationToken cancel = default, RheobaseHint? hint = null)
    {
        var s = settings ?? ReadoutSettings.Default;
        var sim = s.Simulation;
        double dt = sim.DtMs;
        double area = cell.Model.Geometry.AreaUm2;
        var notes = new List<string>();

        // 1. Rest: settle at zero current.
        var settle = Simulator.Run(cell, new NoCurrent(), s.SettleMs, sim with { RecordEvery = 0 }, null, cancel);
        var rest = settle.FinalState;
        bool firesAtRest = settle.SpikeTimesMs.Any(t => t > s.SettleMs / 2);
        double? restMv = firesAtRest ? null : rest.VoltageMv;
        if (firesAtRest) notes.Add("The cell fires without input; passive read-outs and rheobase are not defined.");
        double gSlope = Passive.SteadySlopeConductance(cell, rest.VoltageMv);
        if (!(gSlope > 1e-4))
        {
            notes.Add($"Steady-state slope conductance at rest is {gSlope:G3} mS/cm2 (not positive); passive steps sized from total leak instead.");
            gSlope = Math.Max(1e-3, cell.Model.Channels.Where(c => c.Entry.Gates.Count == 0).Sum(c => c.EffectiveDensityMsPerCm2));
        }

        // 2. The small passive step (input resistance, time constant) starts from rest like the rheobase search and
        // does not depend on it: it runs on its own thread while the search runs (same results, less waiting).
        // Sag (3.) is measured in the second stage.
        var passiveTask = firesAtRest ? null : Task.Run(() => PassiveStep(cell, s, rest, gSlope, cancel), cancel);
        // 4. Rheobase by k-section bisection.
        // Search up to the current that would hold a passive membrane 150 mV above rest (beyond that the model
        // leaves any physiological range), and never past 200 uA/cm2 (10 nA on 5000 um2).
        var (startSearch, maxSearch) = RheobaseSearchRange(gSlope);
        var found = firesAtRest ? new RheobaseSearch.RheobaseResult(null, null, null) : RheobaseSearch.Rheobase(cell, rest, startSearch, maxSearch, s, cancel, hint?.PredictFor(gSlope));
        var gap = found.Bracket?.NotMonotone;
        // A seeded search that saw spiking stop and start again took a path of its own through the gap: measure again
        // unseeded, so the live read-outs equal a cold measurement of the same cell (the one a share link stores).
        if (gap is not null && hint is not null) found = RheobaseSearch.Rheobase(cell, rest, startSearch, maxSearch, s, cancel);
        var (rheo, knownLatency, resume, outOfRange) = found;
        if (!firesAtRest && rheo is null) notes.Add($"No spike for steps up to {maxSearch:G3} uA/cm2.");
        if (outOfRange is { } runaway)
            notes.Add($"The step of {runaway:G4} uA/cm2 drove the membrane past 1000 mV: the model has no stable response to it. " +
                "The rheobase search counts such steps as no spike.");
        var notMonotone = rheo?.NotMonotone ?? gap;
        if (notMonotone is { } nm)
            notes.Add($"Spiking is not monotone in the step amplitude here: the step of {nm.HeldUaPerCm2:G4} uA/cm2 crosses the spike detection level, " +
                $"the larger step of {nm.FailedAboveUaPerCm2:G4} uA/cm2 does not. The rheobase search assumes larger steps keep spiking; " +
                "it reports the lowest onset its probes found, and a smaller step may also spike.");
        double? rheobase = rheo?.AtOrAboveUaPerCm2;
        var (rin, tau, passiveNote) = passiveTask is null ? (null, null, null) : passiveTask.GetAwaiter().GetResult();
        if (passiveNote is not null) notes.Add(passiveNote);
        SpikeShape? shape = null;
        double? latency = null;
        {
            if (rheobase is { } rb)
            {
                // 5. Spike shape and latency at rheobase.
                // The search saw when the first spike comes; record only up to 150 ms past it (enough for its shape,
                // after-hyperpolarisation window and a following spike), starting from the search's resume point 20 ms
                // before the spike when it kept one (near rheobase the first spike can come a second after onset).
                double recordMs = knownLatency is { } kl ? Math.Min(100 + s.StepDurationMs, 100 + kl + 150) : 100 + s.StepDurationMs;
                var step = Protocols.Step(rb, 100, s.StepDurationMs);
                var recordAll = sim with { RecordEvery = 1 };
                var at = resume is not null && resume.Step < (int)Math.Round(recordMs / dt) ? Simulator.Resume(cell, step, resume, recordMs, recordAll, cancel) : null;
                if (at is null || !at.SpikeTimesMs.Any(t => t >= 100)) at = Simulator.Run(cell, step, recordMs, recordAll, rest, cancel);
                var inStep = at.SpikeTimesMs.Where(t => t >= 100).ToArray();
                if (inStep.Length > 0)
                {
                    latency = inStep[0] - 100;
                    shape = SpikeShapes.Measure(at.VoltageMv, dt, at.TimeMs[0], inStep[0], inStep.Length > 1 ? inStep[1] : null, s.ThresholdSlopeMvPerMs);
                }
                // A spike must be regenerative: its upstroke must outrun the passive charging rate of the step (I/C) by
                // a wide margin. Without this, a large step that merely pushes V past the detection level (a cell with
                // its sodium switched off) would be given a rheobase.
                double chargingRate = rb / cell.Model.Geometry.CapacitanceUfPerCm2;
                if (shape is null || shape.MaxRiseMvPerMs < Math.Max(s.ThresholdSlopeMvPerMs, 3 * chargingRate))
                {
                    notes.Add($"Steps up to {rb:G3} uA/cm2 cross the detection level without a regenerative spike (upstroke no faster than passive charging); no rheobase.");
                    rheobase = null;
                    shape = null;
                    latency = null;
                }
            }
        }
        return new CellReadouts
        {
            RestingPotentialMv = restMv,
            FiresAtRest = firesAtRest,
            InputResistanceMOhm = rin,
            MembraneTimeConstantMs = tau,
            RheobaseUaPerCm2 = rheobase,
            RheobasePa = rheobase is { } r ? cell.Model.Geometry.DensityToPicoamps(r) : null,
            RheobaseToleranceUaPerCm2 = rheobase is null ? null : rheo?.ToleranceUaPerCm2,
            ThresholdMv = shape?.ThresholdMv,
            PeakMv = shape?.PeakMv,
            AmplitudeMv = shape?.AmplitudeMv,
            HalfWidthMs = shape is { } sh && !double.IsNaN(sh.HalfWidthMs) ? sh.HalfWidthMs : null,
            AfterHyperpolarisationMv = shape?.AfterHyperpolarisationMv,
            MaxRiseMvPerMs = shape?.MaxRiseMvPerMs,
            FirstSpikeLatencyMs = latency,
            AreaUm2 = area,
            Notes = notes,
            RestState = rest,
            SlopeConductanceMsPerCm2 = gSlope,
            SpikingNotMonotone = notMonotone is not null,
            IsComplete = false,
        };
    }

    /// <summary>
    /// Where the rheobase search starts (a step holding a passive membrane 5 mV above rest) and how far it goes (150 mV
    /// above rest, at most 200 uA/cm2), from the steady-state slope conductance at rest (mS/cm2).
    /// </summary>
    public static (double StartUaPerCm2, double MaxUaPerCm2) RheobaseSearchRange(double slopeConductanceMsPerCm2) =>
        (slopeConductanceMsPerCm2 * 5, Math.Min(slopeConductanceMsPerCm2 * 150, 200));

    /// <summary>
    /// Input resistance and time constant from a small hyperpolarising step. Both need a passive response: when the step
    /// evokes a spike or the membrane ends up moving against the current (a rest that is not stable), they are left
    /// undefined and the note says why.
    /// </summary>
    private static (double? Rin, double? Tau, string? Note) PassiveStep(CompiledCell cell, ReadoutSettings s, CellState rest, double gSlope, CancellationToken cancel)
    {
        var sim = s.Simulation;
        double dt = sim.DtMs;
        double area = cell.Model.Geometry.AreaUm2;
        double iSmall = s.PassiveDeflectionMv * gSlope;
        double passiveMs = s.PassiveStepMs;
        var small = Simulator.Run(cell, Protocols.Step(iSmall, 100, passiveMs), 100 + passiveMs, sim with { RecordEvery = 1, RecordCurrents = false }, rest, cancel);
        int onset = (int)Math.Round(100 / dt);
        int endIdx = (int)Math.Round((100 + passiveMs) / dt);
        double vEnd = Mean(small.VoltageMv, endIdx - (int)(20 / dt), endIdx);
        double dv = vEnd - rest.VoltageMv;
        double nA = iSmall * area / 100.0 / 1000.0;
        if (small.SpikeTimesMs.Count > 0 || !(dv * iSmall > 0))
            return (null, null, $"The small hyperpolarising step ({iSmall:G3} uA/cm2) did not give a passive response " +
                (small.SpikeTimesMs.Count > 0 ? "(it evoked a spike)" : $"(V moved {dv:+0.###;-0.###} mV, against the current)") + "; input resistance and time constant are not defined.");
        double? rin = Math.Abs(nA) > 0 ? dv / nA : null;
        return (rin, Passive.TimeConstantMs(small.VoltageMv, dt, onset, rest.VoltageMv, dv), null);
    }

    /// <summary>Sag ratio from a larger hyperpolarising step: (steady V - lowest V) / (rest - lowest V).</summary>
    private static double Sag(CompiledCell cell, ReadoutSettings s, CellState rest, double gSlope, CancellationToken cancel)
    {
        var sim = s.Simulation;
        double dt = sim.DtMs;
        double iSag = s.SagDeflectionMv * gSlope;
        var big = Simulator.Run(cell, Protocols.Step(iSag, 100, 1000), 1100, sim with { RecordEvery = 1 }, rest, cancel);
        int bOn = (int)Math.Round(100 / dt), bEnd = (int)Math.Round(1100 / dt);
        double vMin = double.PositiveInfinity;
        for (int i = bOn; i < bEnd; i++) vMin = Math.Min(vMin, big.VoltageMv[i]);
        double vSs = Mean(big.VoltageMv, bEnd - (int)(50 / dt), bEnd);
        double peakDefl = rest.VoltageMv - vMin;
        return peakDefl > 1e-9 ? Math.Max(0, (vSs - vMin) / peakDefl) : 0;
    }

    /// <summary>
    /// The second stage: the f-I curve from 0 to a multiple of rheobase, its gain, the excitability class, adaptation
    /// and (when the settings ask) the depolarisation-block search, added to a first stage's result.
    /// </summary>
    public static CellReadouts Complete(CompiledCell cell, CellReadouts first, ReadoutSettings? settings = null, CancellationToken cancel = default)
    {
        if (first.IsComplete) return first;
        var s = settings ?? ReadoutSettings.Default;
        var sim = s.Simulation;
        var rest = first.RestState ?? throw new ArgumentException("the first stage's result carries no rest state", nameof(first));
        double area = first.AreaUm2;
        var notes = first.Notes.ToList();
        IReadOnlyList<FiPoint> fi = [];
        IReadOnlyList<FiPoint> extra = [];
        double? gain = null, onsetCurrent = null, onsetRate = null, adaptStep = null, adaptRatio = null, adaptIndex = null, block = null, blockLimit = null;
        int? cls = null;
        // 3. Sag from a larger hyperpolarising step, on its own thread beside the f-I sweep (it starts from rest too).
        var sagTask = !first.FiresAtRest && s.IncludeSag && first.SlopeConductanceMsPerCm2 is { } gSlope ? Task.Run(() => Sag(cell, s, rest, gSlope, cancel), cancel) : null;
        if (first.RheobaseUaPerCm2 is { } rb2)
        {
            double rb = rb2;
            // 6. f-I curve from 0 to a multiple of rheobase.
            // Extra steps (e.g. the batch's standard absolute steps) ride along in the same sweep.
            var grid = Protocols.StepFamily(0, s.FiMaxMultiple * rb, s.FiSteps).Select(p => p.AmplitudeUaPerCm2).ToArray();
            var all = FiCurve.Measure(cell, [.. grid, .. s.ExtraStepsUaPerCm2], s.StepDurationMs, rest, sim, cancel);
            fi = all.Take(grid.Length).ToArray();
            extra = all.Skip(grid.Length).ToArray();
            gain = FiCurve.Gain(fi);
            // 7. Excitability class from the onset of sustained firing.
            // When the class step equals the f-I step, the f-I curve already brackets the onset of sustained firing.
            (double, double)? known = null;
            if (s.ClassStepMs == s.StepDurationMs)
            {
                int firstLate = fi.ToList().FindIndex(p => p.LateRateHz > 0);
                if (firstLate > 0 && fi.Skip(firstLate).All(p => p.LateRateHz > 0)) known = (fi[firstLate - 1].CurrentUaPerCm2, fi[firstLate].CurrentUaPerCm2);
            }
            // Every point the search measures is kept: the onset is always one of them (or an f-I point), so its rate needs
            // no run of its own.
            var classPoints = new Dictionary<double, FiPoint>();
            if (s.ClassStepMs == s.StepDurationMs) foreach (var p in fi) classPoints[p.CurrentUaPerCm2] = p;
            var sustained = RheobaseSearch.FindOnset(amps =>
            {
                var pts = FiCurve.Measure(cell, amps, s.ClassStepMs, rest, sim, cancel);
                foreach (var p in pts) classPoints[p.CurrentUaPerCm2] = p;
                return pts.Select(p => p.LateRateHz > 0).ToArray();
            }, rb, rb * s.BlockSearchMultiple, s.RheobaseAbsoluteToleranceUaPerCm2, s.ClassRelativeTolerance, cancel, known);
            if (sustained is not null)
            {
                onsetCurrent = sustained.AtOrAboveUaPerCm2;
                var p = classPoints.TryGetValue(onsetCurrent.Value, out var seen) ? seen : FiCurve.Measure(cell, [onsetCurrent.Value], s.ClassStepMs, rest, sim, cancel)[0];
                onsetRate = p.LateRateHz;
                cls = onsetRate < s.ClassOneOnsetRateHz ? 1 : 2;
            }
            else
            {
                notes.Add($"No sustained firing for steps up to {rb * s.BlockSearchMultiple:G3} uA/cm2; class not defined.");
            }
            // 8. Adaptation on a step well above onset.
            // The f-I curve already holds steps up to 3 x rheobase: use its first step at or above the target when it
            // is within 10 % of it, and simulate the target itself otherwise.
            double target = Math.Max(s.AdaptationStepMultiple * rb, 1.2 * (onsetCurrent ?? rb));
            var fromCurve = fi.FirstOrDefault(p => p.CurrentUaPerCm2 >= target && p.CurrentUaPerCm2 <= 1.1 * target);
            var ad = fromCurve ?? FiCurve.Measure(cell, [target], s.StepDurationMs, rest, sim, cancel)[0];
            adaptStep = ad.CurrentUaPerCm2;
            (adaptRatio, adaptIndex) = Adaptation(ad.SpikeTimesMs);
            if (adaptRatio is null) notes.Add($"Fewer than three spikes at {adaptStep:G3} uA/cm2; adaptation not defined.");
            // 9. Depolarisation block: the smallest step above sustained firing where late firing stops.
            blockLimit = rb * s.BlockSearchMultiple;
            if (onsetCurrent is { } oc && s.IncludeDepolarisationBlock)
            {
                var b = RheobaseSearch.FindOnset(amps =>
                {
                    var pts = FiCurve.Measure(cell, amps.Select(a => oc + a).ToArray(), s.StepDurationMs, rest, sim, cancel);
                    return pts.Select(p => p.LateRateHz == 0).ToArray();
                }, oc * 0.5, blockLimit.Value - oc, s.RheobaseAbsoluteToleranceUaPerCm2 * 10, 0.02, cancel);
                if (b is not null) block = oc + b.AtOrAboveUaPerCm2;
            }
        }

        double? sag = sagTask is null ? null : sagTask.GetAwaiter().GetResult();
        return first with
        {
            SagRatio = sag,
            FiCurve = fi,
            FiGainHzPerUaPerCm2 = gain,
            FiGainHzPerNa = gain is { } g ? g / (area * 1e-5) : null,
            SustainedFiringOnsetUaPerCm2 = onsetCurrent,
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
    /// Adaptation ratio (last ISI / first ISI) and adaptation index, the mean over successive pairs of
    /// (ISI[n+1] - ISI[n]) / (ISI[n+1] + ISI[n]); both need at least three spikes (common practice).
    /// </summary>
    public static (double? Ratio, double? Index) Adaptation(IReadOnlyList<double> spikeTimesMs)
    {
        if (spikeTimesMs.Count < 3) return (null, null);
        var isi = new double[spikeTimesMs.Count - 1];
        for (int i = 0; i < isi.Length; i++) isi[i] = spikeTimesMs[i + 1] - spikeTimesMs[i];
        double sum = 0;
        for (int i = 0; i + 1 < isi.Length; i++) sum += (isi[i + 1] - isi[i]) / (isi[i + 1] + isi[i]);
        return (isi[^1] / isi[0], sum / (isi.Length - 1));
    }

    private static double Mean(double[] v, int from, int to)
    {
        from = Math.Max(0, from);
        to = Math.Min(v.Length, to);
        double s = 0;
        for (int i = from; i < to; i++) s += v[i];
        return to > from ? s / (to - from) : double.NaN;
    }
}
