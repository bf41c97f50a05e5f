using ExprModel.Core.Simulation;
using MathNet.Numerics;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Read-outs that tell the two classic mechanisms of spike-frequency adaptation apart (DOMAIN.md, common practice): a
/// slow potassium current (M-type, Kv7) builds up over a train and deepens the after-hyperpolarisation while the spike
/// threshold stays roughly constant; persistent or slowly inactivating sodium leaves channels inactivated after each spike,
/// so the threshold rises. On one suprathreshold step (default twice the rheobase, 1 s, after the cell settled at zero
/// current): per spike the voltage threshold (dV/dt criterion, as <see cref="SpikeShapes"/>), the after-hyperpolarisation
/// depth (threshold minus the trough before the next spike) and each channel's mean current over the inter-spike ramp
/// (trough to the next spike's threshold); and the effective threshold probed by a brief test pulse after one spike and
/// after the train, against the pulse threshold at rest.
/// </summary>
public static class AdaptationMechanisms
{
    /// <summary>Largest test pulse tried (uA/cm2); a cell that needs more is reported as not excitable by the pulse.</summary>
    public const double ProbeLimitUaPerCm2 = 128;

    /// <summary>
    /// Threshold, trough, after-hyperpolarisation depth and interval of every spike of a train on a sampled trace (recorded
    /// or simulated). The trough of a spike is the minimum between its peak and the next spike's threshold (the last spike:
    /// up to <paramref name="endMs"/>). No currents: a recording has none.
    /// </summary>
    public static IReadOnlyList<TrainSpike> SpikesOfTrain(ReadOnlySpan<double> voltageMv, double dtMs, double startMs,
        IReadOnlyList<double> spikeTimesMs, double endMs, double thresholdSlopeMvPerMs = 20)
    {
        var spikes = new List<TrainSpike>();
        foreach (var (spike, _, _) in Walk(voltageMv, dtMs, startMs, spikeTimesMs, endMs, thresholdSlopeMvPerMs)) spikes.Add(spike);
        return spikes;
    }

    /// <summary>Least-squares slope of values against their index (per spike); null below three values.</summary>
    public static double? SlopePerSpike(IReadOnlyList<double> values)
    {
        if (values.Count < 3) return null;
        var x = Enumerable.Range(0, values.Count).Select(i => (double)i).ToArray();
        return Fit.Line(x, values.ToArray()).B;
    }

    /// <summary>
    /// Runs the protocol on a cell: the train at <paramref name="stepUaPerCm2"/> (or <see cref="MechanismSettings.StepRheobaseMultiple"/>
    /// times the rheobase when null) and the threshold probes.
    /// </summary>
    public static MechanismReport Measure(CompiledCell cell, double? stepUaPerCm2 = null, MechanismSettings? settings = null,
        CancellationToken cancel = default)
    {
        var s = settings ?? MechanismSettings.Default;
        if (s.Problem() is { } bad) throw new ArgumentException($"adaptation mechanisms: {bad}", nameof(settings));
        var notes = new List<string>();
        double step = stepUaPerCm2 ?? DefaultStep(cell, s, cancel);
        if (!double.IsFinite(step) || step <= 0 || step > 1000)
            throw new ArgumentException($"adaptation mechanisms: the step amplitude must lie in (0, 1000] uA/cm2 (got {step})", nameof(stepUaPerCm2));

        var rest = Simulator.Run(cell, new NoCurrent(), s.SettleMs, s.Simulation with { RecordEvery = 0 }, null, cancel);
        if (Rest.FiresAtRest(rest.SpikeTimesMs, s.SettleMs)) notes.Add("The cell fires without input; the train starts from a firing cell.");
        var restState = rest.FinalState;
        double onset = Protocols.BaselineMs, end = onset + s.StepDurationMs;
        var train = Simulator.Run(cell, Protocols.Step(step, onset, s.StepDurationMs), end,
            s.Simulation with { RecordEvery = 1, RecordGateStates = true }, restState, cancel);
        var inStep = train.SpikeTimesMs.Where(t => t >= onset).ToArray();
        var labels = Simulator.ChannelLabels(cell);
        var spikes = new List<TrainSpike>();
        foreach (var (spike, from, to) in Walk(train.VoltageMv, train.SampleIntervalMs, 0, inStep, end, s.ThresholdSlopeMvPerMs))
            spikes.Add(to > from ? spike with { RampCurrentsUaPerCm2 = MeanCurrents(cell, train, from, to) } : spike);
        if (spikes.Count < 2) notes.Add($"Fewer than two spikes on the {step:G4} uA/cm2 step; no trend across the train.");

        var withInterval = spikes.Where(x => x.IntervalMs is not null).ToArray();
        var ramps = spikes.Where(x => x.RampCurrentsUaPerCm2 is not null).Select(x => x.RampCurrentsUaPerCm2!).ToArray();
        double[]? change = ramps.Length >= 2 ? ramps[^1].Zip(ramps[0], (a, b) => a - b).ToArray() : null;
        string? building = null;
        if (change is not null)
        {
            int best = Array.IndexOf(change, change.Max());
            if (change[best] > 1e-3) building = labels[best];
        }

        var probes = Probes(cell, restState, train.FinalState, rest.FinalState.VoltageMv, s, notes, cancel);
        int every = Math.Max(1, (int)Math.Round(0.1 / train.SampleIntervalMs));
        return new MechanismReport
        {
            StepUaPerCm2 = step,
            StepDurationMs = s.StepDurationMs,
            RestMv = restState.VoltageMv,
            ChannelLabels = labels,
            Spikes = spikes,
            ThresholdRiseMv = spikes.Count >= 2 ? spikes[^1].ThresholdMv - spikes[0].ThresholdMv : null,
            ThresholdSlopeMvPerSpike = SlopePerSpike(spikes.Select(x => x.ThresholdMv).ToArray()),
            AfterHyperpolarisationChangeMv = withInterval.Length >= 2
                ? withInterval[^1].AfterHyperpolarisationMv - withInterval[0].AfterHyperpolarisationMv
                : null,
            AfterHyperpolarisationSlopeMvPerSpike = SlopePerSpike(withInterval.Select(x => x.AfterHyperpolarisationMv).ToArray()),
            RampCurrentChangeUaPerCm2 = change,
            BuildingUpChannel = building,
            AfterOneSpike = probes.OneSpike,
            AfterTrain = probes.Train,
            TrainVoltageMv = train.VoltageMv.Where((_, i) => i % every == 0).ToArray(),
            TrainSampleMs = train.SampleIntervalMs * every,
            Notes = notes,
        };
    }

    private static double DefaultStep(CompiledCell cell, MechanismSettings s, CancellationToken cancel)
    {
        var first = Features.MeasureFirst(cell, ReadoutSettings.Batch with { Simulation = s.Simulation }, cancel);
        if (first.RheobaseUaPerCm2 is not { } r)
            throw new ArgumentException("adaptation mechanisms: the model has no rheobase (it fires at rest or never spikes); give the step amplitude.");
        return s.StepRheobaseMultiple * r;
    }

    private static List<(TrainSpike Spike, int RampFrom, int RampTo)> Walk(ReadOnlySpan<double> v, double dtMs, double startMs,
        IReadOnlyList<double> spikeTimesMs, double endMs, double slope)
    {
        var list = new List<(TrainSpike, int, int)>();
        Walk(v, dtMs, startMs, spikeTimesMs, endMs, slope, list);
        return list;
    }

    private static void Walk(ReadOnlySpan<double> v, double dtMs, double startMs, IReadOnlyList<double> spikeTimesMs, double endMs, double slope,
        List<(TrainSpike, int, int)> into)
    {
        int last = Math.Min(v.Length - 1, (int)Math.Round((endMs - startMs) / dtMs));
        var thresholds = new int[spikeTimesMs.Count];
        for (int k = 0; k < thresholds.Length; k++) thresholds[k] = ThresholdIndex(v, dtMs, startMs, spikeTimesMs[k], slope);
        for (int k = 0; k < spikeTimesMs.Count; k++)
        {
            int th = thresholds[k];
            if (th < 0) continue;
            int cross = (int)Math.Round((spikeTimesMs[k] - startMs) / dtMs);
            int peak = cross;
            int lookAhead = Math.Min(v.Length - 1, cross + (int)(5 / dtMs));
            for (int i = cross; i <= lookAhead; i++) if (v[i] > v[peak]) peak = i;
            bool hasNext = k + 1 < spikeTimesMs.Count && thresholds[k + 1] > peak;
            int stop = hasNext ? thresholds[k + 1] : last;
            int trough = peak;
            for (int i = peak; i <= stop; i++) if (v[i] < v[trough]) trough = i;
            var spike = new TrainSpike(k + 1, spikeTimesMs[k], v[th], v[trough], v[th] - v[trough],
                hasNext ? spikeTimesMs[k + 1] - spikeTimesMs[k] : null, null);
            into.Add((spike, hasNext ? trough : 0, hasNext ? stop : 0));
        }
    }

    /// <summary>The sample where dV/dt last exceeds the criterion going back from the detection crossing (as <see cref="SpikeShapes"/>).</summary>
    private static int ThresholdIndex(ReadOnlySpan<double> v, double dtMs, double startMs, double spikeTimeMs, double slope)
    {
        int cross = (int)Math.Round((spikeTimeMs - startMs) / dtMs);
        if (cross <= 1 || cross >= v.Length) return -1;
        int lookBack = Math.Max(1, cross - (int)(10 / dtMs));
        for (int i = cross; i >= lookBack; i--)
            if ((v[i] - v[i - 1]) / dtMs < slope) return i;
        return lookBack;
    }

    private static double[] MeanCurrents(CompiledCell cell, Trace trace, int from, int to)
    {
        var sum = new double[cell.ChannelCount];
        for (int i = from; i <= to; i++)
        {
            var c = Simulator.ChannelCurrentsAt(cell, trace, i);
            for (int j = 0; j < sum.Length; j++) sum[j] += c[j];
        }
        for (int j = 0; j < sum.Length; j++) sum[j] /= to - from + 1;
        return sum;
    }

    private static (ThresholdProbe? OneSpike, ThresholdProbe? Train) Probes(CompiledCell cell, CellState rest, CellState afterTrain,
        double restMv, MechanismSettings s, List<string> notes, CancellationToken cancel)
    {
        double delay = s.ProbeDelayMs, w = s.ProbePulseMs;
        double total = delay + w + s.ProbeWindowMs;
        double? atRest = PulseThreshold(cell, rest, a => new StepCurrent(delay, w, a), delay, total, s, cancel);
        if (atRest is not { } threshold)
        {
            notes.Add($"No spike for a {w:G3} ms pulse up to {ProbeLimitUaPerCm2} uA/cm2 at rest; threshold probes not measured.");
            return (null, null);
        }

        var train = new ThresholdProbe("after the train", w, delay, threshold,
            PulseThreshold(cell, afterTrain, a => new StepCurrent(delay, w, a), delay, total, s, cancel), restMv,
            Simulator.Run(cell, new NoCurrent(), delay, s.Simulation with { RecordEvery = 0 }, afterTrain, cancel).FinalState.VoltageMv);

        // One conditioning spike from a pulse at twice the rest threshold, 10 ms into the run; the test follows its crossing.
        var conditioning = new StepCurrent(10, w, 2 * threshold);
        var run = Simulator.Run(cell, conditioning, 10 + w + 20, s.Simulation with { RecordEvery = 0 }, rest, cancel);
        if (run.SpikeTimesMs.Count == 0)
        {
            notes.Add("The conditioning pulse (twice the pulse threshold) evoked no spike; the after-one-spike probe is not measured.");
            return (null, train);
        }
        double testAt = run.SpikeTimesMs[0] + delay;
        var before = Simulator.Run(cell, conditioning, testAt, s.Simulation with { RecordEvery = 0 }, rest, cancel).FinalState.VoltageMv;
        var after = PulseThreshold(cell, rest, a => new SummedCurrent([conditioning, new StepCurrent(testAt, w, a)]), testAt,
            testAt + w + s.ProbeWindowMs, s, cancel);
        return (new ThresholdProbe("after one spike", w, delay, threshold, after, restMv, before), train);
    }

    /// <summary>
    /// Smallest pulse amplitude (within the relative tolerance) whose run has a spike at or after <paramref name="testOnsetMs"/>,
    /// by k-section with eight amplitudes per round in one sweep; null when none up to <see cref="ProbeLimitUaPerCm2"/>.
    /// </summary>
    private static double? PulseThreshold(CompiledCell cell, CellState start, Func<double, Stimulus> stimulusFor, double testOnsetMs,
        double durationMs, MechanismSettings s, CancellationToken cancel)
    {
        bool[] Spiking(double[] amplitudes) => Simulator
            .SpikeTimes(cell, amplitudes.Select(stimulusFor).ToArray(), durationMs, s.Simulation with { RecordEvery = 0 }, start, cancel)
            .Select(l => l.Any(t => t >= testOnsetMs - 1e-9)).ToArray();

        double[] grow = [1, 2, 4, 8, 16, 32, 64, ProbeLimitUaPerCm2];
        var hits = Spiking(grow);
        int first = Array.IndexOf(hits, true);
        if (first < 0) return null;
        double hi = grow[first], lo = first > 0 ? grow[first - 1] : 0;
        while (hi - lo > s.ProbeRelativeTolerance * hi)
        {
            var amps = Enumerable.Range(1, 8).Select(j => lo + (hi - lo) * j / 9).ToArray();
            int k = Array.IndexOf(Spiking(amps), true);
            if (k < 0) lo = amps[^1];
            else
            {
                hi = amps[k];
                if (k > 0) lo = amps[k - 1];
            }
        }
        return hi;
    }
}
