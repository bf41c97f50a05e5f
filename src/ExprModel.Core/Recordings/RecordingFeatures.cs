using ExprModel.Core.Analysis;

namespace ExprModel.Core.Recordings;

/// <summary>
/// Read-outs of a recorded step family with the simulator's definitions and code: spikes by
/// <see cref="Simulation.SpikeDetector"/>, spike shape by <see cref="SpikeShapes.Measure"/>, time constant by
/// <see cref="Passive.TimeConstantMs"/>, rates by <see cref="FiCurve.Point"/> and <see cref="FiCurve.Gain"/>, adaptation by
/// <see cref="ExprModel.Core.Analysis.Adaptation.FromSpikeTimes"/>. Where the simulator searches for a current, the recording offers only its steps:
/// rheobase is the smallest step that spikes (the spacing to the step below bounds it), and adaptation is read on the
/// first step at or above twice that. Each sweep is measured from its own baseline, so drift between sweeps does not
/// enter any deflection. Definitions: DEVELOPERS.md, "Read-outs" and "Recordings".
/// </summary>
public static class RecordingFeatures
{
    public static RecordedReadouts Measure(RecordedCell cell, RecordingReadoutSettings? settings = null)
    {
        var s = settings ?? RecordingReadoutSettings.Default;
        var notes = new List<string>(cell.Notes);
        var sweeps = cell.Sweeps.Select(w => SweepAnalysis.Of(w, s)).ToArray();
        foreach (var w in sweeps) if (w.Excluded is not null) notes.Add(w.Excluded);
        var used = sweeps.Where(w => w.Excluded is null).ToArray();
        if (sweeps.Any(w => w.SmoothingMs > 0))
            notes.Add($"Noisy baseline (rms {sweeps.Max(w => w.NoiseMv):0.###} mV): spikes and their shape are measured on a centred moving average of up to " +
                $"{sweeps.Max(w => w.SmoothingMs):0.###} ms, which holds the slope noise near {s.SlopeNoiseTargetMvPerMs} mV/ms against the " +
                    $"{s.Shared.ThresholdSlopeMvPerMs} mV/ms threshold criterion.");

        // Rest: the median of the sweeps' own baselines; a cell that spikes before most steps fires at rest.
        var baselines = sweeps.Select(w => w.BaselineMv).Where(double.IsFinite).Order().ToArray();
        bool firesAtRest = sweeps.Count(w => w.SpikesBeforeStep > 0) * 2 > sweeps.Length;
        double? rest = firesAtRest || baselines.Length == 0 ? null : Median(baselines);
        if (firesAtRest) notes.Add("The cell spikes before the step in most sweeps: it fires at rest; the resting potential is not defined.");
        if (baselines.Length > 1 && baselines[^1] - baselines[0] > 3)
            notes.Add($"The baseline drifts between sweeps ({baselines[0]:0.#} to {baselines[^1]:0.#} mV); every deflection is taken from its own sweep's " +
                "baseline.");

        var (rin, tau) = PassiveReadouts(used, s, notes);
        double? sag = Sag(used, s, notes);

        // Depolarising steps in order of amplitude: rheobase, spike shape, rates.
        var up = used.Where(w => w.AmplitudePa > 0).OrderBy(w => w.AmplitudePa).ToArray();
        var fi = used.Where(w => w.AmplitudePa >= 0).OrderBy(w => w.AmplitudePa).Select(w => new RecordedFiPoint(w.Sweep.SweepNumber,
            w.AmplitudePa, w.Rates!)).ToArray();
        int first = Array.FindIndex(up, w => w.Rates!.SpikesInStep > 0);
        SweepAnalysis? rheo = first >= 0 ? up[first] : null;
        SpikeShape? shape = null;
        double? latency = null, spacing = null;
        if (rheo is not null)
        {
            var spikes = rheo.Rates!.SpikeTimesMs;
            shape = SpikeShapes.Measure(rheo.MeasuredMv, rheo.Sweep.SampleIntervalMs, 0, spikes[0], spikes.Count > 1 ? spikes[1] : null,
                s.Shared.ThresholdSlopeMvPerMs);
            latency = spikes[0] - rheo.Step!.OnsetMs;
            if (first > 0) spacing = rheo.AmplitudePa - up[first - 1].AmplitudePa;
            else notes.Add($"The smallest depolarising step ({rheo.AmplitudePa:0.#} pA, sweep {rheo.Sweep.SweepNumber}) already spikes: the rheobase is at " +
                "or below it.");
            if (up.Skip(first + 1).FirstOrDefault(w => w.Rates!.SpikesInStep == 0) is { } silent)
                notes.Add($"Spiking is not monotone in the step amplitude: sweep {rheo.Sweep.SweepNumber} ({rheo.AmplitudePa:0.#} pA) spikes, the larger " +
                    $"step of sweep {silent.Sweep.SweepNumber} ({silent.AmplitudePa:0.#} pA) does not.");
            // The simulator's acceptance test, same function: a crossing whose upstroke is no faster than passive charging
            // (or the threshold criterion) is a membrane pushed past the detection level, not an action potential.
            double chargingRate = rin is > 0 && tau is > 0 ? rheo.AmplitudePa / (1000 * tau.Value / rin.Value) : 0;
            if (!SpikeAtRheobase.IsRegenerative(shape, chargingRate, s.Shared.ThresholdSlopeMvPerMs))
            {
                notes.Add($"The smallest step that crosses the detection level (sweep {rheo.Sweep.SweepNumber}, {rheo.AmplitudePa:0.#} pA) has no " +
                    "regenerative spike " +
                    $"(largest rise {(shape is null ? "not measurable" : $"{shape.MaxRiseMvPerMs:0.##} mV/ms")}, needs " +
                        $"{Math.Max(s.Shared.ThresholdSlopeMvPerMs, 3 * chargingRate):0.##} mV/ms): " +
                    "as for the simulator, no rheobase and no spike read-outs.");
                (rheo, shape, latency, spacing) = (null, null, null, null);
            }
        }
        else notes.Add(up.Length == 0 ? "No usable depolarising step: rheobase and spike read-outs are not defined."
            : $"No spike in any step up to {up[^1].AmplitudePa:0.#} pA: rheobase is not defined.");

        double? gain = FiCurve.Gain(fi.Select(p => p.Rates).ToArray());
        // Sustained firing: the first step whose second half holds two spikes; class from its late rate (the family's steps are the resolution).
        var sustained = fi.FirstOrDefault(p => p.Rates.LateRateHz > 0);
        int? cls = sustained is null ? null : sustained.Rates.LateRateHz < s.Shared.ClassOneOnsetRateHz ? 1 : 2;
        if (sustained is not null && fi.FirstOrDefault(p => p.CurrentPa < sustained.CurrentPa && p.CurrentPa > 0) is not null)
            notes.Add($"Excitability class from the onset of sustained firing at the family's steps ({sustained.CurrentPa:0.#} pA, late rate " +
                $"{sustained.Rates.LateRateHz:0.#} Hz): a step spacing coarser than the simulator's search raises the onset rate.");

        var (adaptStep, ratio, index) = Adaptation(fi, rheo, s, notes);
        var readouts = new CellReadouts
        {
            RestingPotentialMv = rest,
            FiresAtRest = firesAtRest,
            InputResistanceMOhm = rin,
            MembraneTimeConstantMs = tau,
            SagRatio = sag,
            RheobasePa = rheo?.AmplitudePa,
            ThresholdMv = shape?.ThresholdMv,
            PeakMv = shape?.PeakMv,
            AmplitudeMv = shape?.AmplitudeMv,
            HalfWidthMs = shape is { } sh && double.IsFinite(sh.HalfWidthMs) ? sh.HalfWidthMs : null,
            AfterHyperpolarisationMv = shape?.AfterHyperpolarisationMv,
            MaxRiseMvPerMs = shape?.MaxRiseMvPerMs,
            FirstSpikeLatencyMs = latency,
            FiGainHzPerNa = gain * 1000,
            OnsetRateHz = sustained?.Rates.LateRateHz,
            ExcitabilityClass = cls,
            AdaptationRatio = ratio,
            AdaptationIndex = index,
            Notes = notes,
        };
        return new RecordedReadouts
        {
            CellId = cell.CellId,
            Source = cell.Source,
            Readouts = readouts,
            RheobaseStepSpacingPa = spacing,
            SustainedFiringOnsetPa = sustained?.CurrentPa,
            AdaptationStepPa = adaptStep,
            SmoothingMs = sweeps.Length == 0 ? 0 : sweeps.Max(w => w.SmoothingMs),
            FiCurve = fi,
            Sweeps = sweeps,
        };
    }

    /// <summary>
    /// Input resistance: least-squares slope through the origin of steady deflection (last 20 ms of the step, from the
    /// sweep's baseline) against current over the small hyperpolarising sweeps (MathNet's line through the origin);
    /// time constant: <see cref="Passive.TimeConstantMs"/> on the sweep whose deflection is nearest the simulator's passive step (-5 mV).
    /// </summary>
    private static (double? Rin, double? Tau) PassiveReadouts(SweepAnalysis[] used, RecordingReadoutSettings s, List<string> notes)
    {
        var down = used.Where(w => w.AmplitudePa < 0 && w.Rates!.SpikesInStep == 0 && w.DeflectionMv < 0).OrderByDescending(w => w.AmplitudePa).ToArray();
        if (down.Length == 0)
        {
            notes.Add("No hyperpolarising step without spikes: input resistance and time constant are not defined.");
            return (null, null);
        }
        var small = down.Where(w => w.DeflectionMv >= -s.SmallDeflectionMv).ToArray();
        if (small.Length == 0)
        {
            small = [down[0]];
            notes.Add($"Every hyperpolarising step moves the membrane more than {s.SmallDeflectionMv} mV; input resistance from the smallest " +
                $"({down[0].AmplitudePa:0.#} pA, {down[0].DeflectionMv:0.#} mV) alone.");
        }
        // mV / nA = MOhm.
        var nA = small.Select(w => w.AmplitudePa / 1000).ToArray();
        var dv = small.Select(w => w.DeflectionMv!.Value).ToArray();
        double rin = small.Length == 1 ? dv[0] / nA[0] : MathNet.Numerics.Fit.LineThroughOrigin(nA, dv);
        var target = s.Shared.PassiveDeflectionMv;
        var tauSweep = down.MinBy(w => Math.Abs(w.DeflectionMv!.Value - target))!;
        var span = tauSweep.MeasuredMv.AsSpan(0, tauSweep.OffsetIndex);
        double? tau = Passive.TimeConstantMs(span, tauSweep.Sweep.SampleIntervalMs, tauSweep.OnsetIndex, tauSweep.BaselineMv, tauSweep.DeflectionMv!.Value);
        if (tau is null) notes.Add($"The response of sweep {tauSweep.Sweep.SweepNumber} gives no exponential charging phase: time constant not defined.");
        return (rin, tau);
    }

    /// <summary>
    /// Sag ratio (V_steady - V_min) / (V_baseline - V_min) on the most hyperpolarising sweep, as the simulator's; the
    /// trough from a 1 ms moving average.
    /// </summary>
    private static double? Sag(SweepAnalysis[] used, RecordingReadoutSettings s, List<string> notes)
    {
        var most = used.Where(w => w.AmplitudePa < 0 && w.Rates!.SpikesInStep == 0).MinBy(w => w.AmplitudePa);
        if (most is null) return null;
        double dt = most.Sweep.SampleIntervalMs;
        int on = most.OnsetIndex, off = most.OffsetIndex;
        var smooth = NoiseSmoothing.MovingAverage(most.Sweep.VoltageMv.AsSpan(on, off - on), Math.Max(1, (int)(s.SagSmoothingMs / dt)) | 1);
        double vMin = smooth.Min();
        double vSs = SweepAnalysis.Mean(most.Sweep.VoltageMv.AsSpan(Math.Max(on, off - (int)Math.Round(s.SagSteadyWindowMs / dt)),
            Math.Min(off - on, (int)Math.Round(s.SagSteadyWindowMs / dt))));
        double peak = most.BaselineMv - vMin;
        if (most.DeflectionMv > -15)
            notes.Add($"The most hyperpolarising step (sweep {most.Sweep.SweepNumber}, {most.AmplitudePa:0.#} pA) reaches only {most.DeflectionMv:0.#} mV; " +
                $"the simulator's sag step aims for {s.Shared.SagDeflectionMv} mV.");
        return peak > 1e-9 ? Math.Max(0, (vSs - vMin) / peak) : 0;
    }

    /// <summary>Adaptation on the first step at or above twice the rheobase (the simulator's multiple), else the largest step.</summary>
    private static (double? StepPa, double? Ratio, double? Index) Adaptation(RecordedFiPoint[] fi, SweepAnalysis? rheo,
        RecordingReadoutSettings s, List<string> notes)
    {
        if (rheo is null) return (null, null, null);
        double target = s.Shared.AdaptationStepMultiple * rheo.AmplitudePa;
        var chosen = fi.FirstOrDefault(p => p.CurrentPa >= target - 1e-9) ?? fi[^1];
        if (chosen.CurrentPa < target - 1e-9) notes.Add($"No step reaches {s.Shared.AdaptationStepMultiple} x rheobase ({target:0.#} pA); adaptation is read " +
            $"on the largest ({chosen.CurrentPa:0.#} pA).");
        var (ratio, index) = ExprModel.Core.Analysis.Adaptation.FromSpikeTimes(chosen.Rates.SpikeTimesMs);
        if (ratio is null) notes.Add($"Fewer than three spikes at {chosen.CurrentPa:0.#} pA (sweep {chosen.SweepNumber}); adaptation not defined.");
        return (chosen.CurrentPa, ratio, index);
    }

    private static double Median(double[] sorted) => sorted.Length % 2 == 1 ? sorted[sorted.Length / 2]
        : (sorted[sorted.Length / 2 - 1] + sorted[sorted.Length / 2]) / 2;
}
