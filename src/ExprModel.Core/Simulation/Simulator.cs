using System.Collections.Concurrent;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The fast fixed-step integrator. Gates live at half steps and V at whole steps (a staggered scheme):
/// each gate takes the exact exponential update for the V of the step's midpoint from a rate table, then V
/// takes the exact exponential update of the linear membrane equation with conductances frozen at their
/// midpoint values. Both updates are unconditionally stable, and staggering makes the scheme second order.
/// Sweeps run one lane per stimulus, in parallel over the machine's cores.
/// </summary>
public static class Simulator
{
    private static readonly ConditionalWeakTable<CompiledCell, ConcurrentDictionary<double, RateTable>> Tables = new();

    private static readonly AsyncLocal<bool> ScalarOnly = new();

    /// <summary>
    /// Lets tests and benchmarks compare the SIMD sweep with the scalar loop. Per logical call flow (AsyncLocal, which
    /// Parallel.For carries to its workers), so tests running at the same time do not switch each other.
    /// </summary>
    internal static bool UseSimd
    {
        get => !ScalarOnly.Value;
        set => ScalarOnly.Value = !value;
    }

    internal static RateTable TableFor(CompiledCell cell, double dtMs) =>
        Tables.GetOrCreateValue(cell).GetOrAdd(dtMs, dt => new RateTable(cell, dt));

    /// <summary>Runs one current-clamp simulation and records the trace.</summary>
    public static Trace Run(CompiledCell cell, Stimulus stimulus, double durationMs, SimulationSettings? settings = null,
        CellState? initial = null, CancellationToken cancel = default)
    {
        settings ??= SimulationSettings.Default;
        Validate(durationMs, settings);
        int steps = (int)Math.Round(durationMs / settings.DtMs);
        return Lane.Run(cell, TableFor(cell, settings.DtMs), stimulus, steps, settings, initial ?? cell.InitialState(), cancel);
    }

    /// <summary>Runs many stimuli on the same cell in parallel, recording only spikes (the f-I path).</summary>
    public static IReadOnlyList<IReadOnlyList<double>> SpikeTimes(CompiledCell cell, IReadOnlyList<Stimulus> stimuli, double durationMs,
        SimulationSettings? settings = null, CellState? initial = null, CancellationToken cancel = default) =>
        Sweep(cell, stimuli, durationMs, settings, initial, null, cancel).Select(l => l.SpikeTimesMs).ToArray();

    /// <summary>
    /// Runs many stimuli on the same cell in parallel, recording only spikes. With <paramref name="resumeMarginMs"/>,
    /// each lane also carries a resume point at least that long before its first spike (see <see cref="Resume"/>), so a
    /// recorded run of the same stimulus can start there instead of from the beginning. Resume points come from the SIMD
    /// sweep; the scalar loop gives none.
    /// </summary>
    public static IReadOnlyList<SweepLane> Sweep(CompiledCell cell, IReadOnlyList<Stimulus> stimuli, double durationMs,
        SimulationSettings? settings = null, CellState? initial = null, double? resumeMarginMs = null, CancellationToken cancel = default)
    {
        try
        {
            return SweepParallel(cell, stimuli, durationMs, settings, initial, resumeMarginMs, cancel);
        }
        catch (AggregateException e) when (e.Flatten().InnerExceptions.FirstOrDefault(x => x is not OperationCanceledException) is { } first)
        {
            // Report the lane's own error (blow-up, bad model), not the parallel wrapper.
            System.Runtime.ExceptionServices.ExceptionDispatchInfo.Capture(first).Throw();
            throw;
        }
    }

    /// <summary>
    /// Continues a run of <paramref name="stimulus"/> from a resume point up to <paramref name="untilMs"/> (times stay
    /// those of the whole run: the trace starts at the resume point's time). The scalar loop computes it.
    /// </summary>
    public static Trace Resume(CompiledCell cell, Stimulus stimulus, ResumePoint from, double untilMs, SimulationSettings? settings = null, CancellationToken cancel = default)
    {
        settings ??= SimulationSettings.Default;
        Validate(untilMs, settings);
        int steps = (int)Math.Round(untilMs / settings.DtMs);
        if (from.Step < 0 || from.Step >= steps) throw new ArgumentOutOfRangeException(nameof(from), $"the resume point (step {from.Step}) must lie before the end of the run (step {steps})");
        return Lane.Run(cell, TableFor(cell, settings.DtMs), stimulus, steps, settings, from.State, cancel, from.Step, from.PreviousVoltageMv);
    }

    private static IReadOnlyList<SweepLane> SweepParallel(CompiledCell cell, IReadOnlyList<Stimulus> stimuli, double durationMs,
        SimulationSettings? settings, CellState? initial, double? resumeMarginMs, CancellationToken cancel)
    {
        settings = (settings ?? SimulationSettings.Default) with { RecordEvery = 0, RecordCurrents = false };
        Validate(durationMs, settings);
        int steps = (int)Math.Round(durationMs / settings.DtMs);
        var table = TableFor(cell, settings.DtMs);
        var start = initial ?? cell.InitialState();
        var result = new SweepLane[stimuli.Count];
        var options = new ParallelOptions { CancellationToken = cancel, MaxDegreeOfParallelism = Environment.ProcessorCount };
        if (SweepKernel.CanRun(cell) && UseSimd)
        {
            int width = SweepKernel.Width;
            int groups = (stimuli.Count + width - 1) / width;
            Parallel.For(0, groups, options, gi =>
            {
                int first = gi * width, count = Math.Min(width, stimuli.Count - first);
                var stims = Enumerable.Range(first, count).Select(i => stimuli[i]).ToArray();
                var lanes = SweepKernel.Run(cell, table, stims, steps, settings, start, resumeMarginMs, cancel);
                for (int l = 0; l < count; l++) result[first + l] = lanes[l];
            });
            return result;
        }
        Parallel.For(0, stimuli.Count, options, i =>
        {
            result[i] = new SweepLane(Lane.Run(cell, table, stimuli[i], steps, settings, start, cancel).SpikeTimesMs, null);
        });
        return result;
    }

    private static void Validate(double durationMs, SimulationSettings s)
    {
        if (!(s.DtMs > 0) || s.DtMs > 1) throw new ArgumentOutOfRangeException(nameof(s), $"dtMs must lie in (0, 1] ms (got {s.DtMs}).");
        if (!(durationMs > 0) || durationMs > 600_000) throw new ArgumentOutOfRangeException(nameof(durationMs), $"durationMs must lie in (0, 600000] (got {durationMs}).");
        if (s.RecordEvery < 0) throw new ArgumentOutOfRangeException(nameof(s), "recordEvery must be >= 0.");
    }

    /// <summary>The hot loop for one stimulus. Flat arrays, no allocation per step.</summary>
    private static class Lane
    {
        /// <param name="firstStep">Step to start at (a resume point's; 0 from the beginning). Times and the stimulus stay those of the whole run.</param>
        /// <param name="previousVoltageMv">V one step before <paramref name="firstStep"/> (defaults to the initial V).</param>
        [MethodImpl(MethodImplOptions.AggressiveOptimization)]
        public static Trace Run(CompiledCell cell, RateTable table, Stimulus stimulus, int steps, SimulationSettings settings, CellState init, CancellationToken cancel,
            int firstStep = 0, double? previousVoltageMv = null)
        {
            // A step (or no current) is computed from its on-range; other stimuli are sampled once per step.
            double[]? stim = null;
            int onFirst = 0, onEnd = 0;
            double onValue = 0, offValue = 0;
            if (stimulus is StepCurrent sc)
            {
                (onFirst, onEnd) = sc.OnRange(settings.DtMs, steps);
                (onValue, offValue) = (sc.HoldingUaPerCm2 + sc.AmplitudeUaPerCm2, sc.HoldingUaPerCm2);
            }
            else if (stimulus is not NoCurrent)
            {
                stim = stimulus.Sample(settings.DtMs, steps);
            }
            int gateCount = cell.GateCount, channelCount = cell.ChannelCount;
            double dt = settings.DtMs;
            var x = (double[])init.Gates.Clone();
            double v = init.VoltageMv, ca = init.CalciumMm;
            var data = table.Data;
            var caDecay = table.CalciumDecay;
            var gbar = cell.Gbar;
            var erev = cell.Erev;
            var mode = cell.Mode;
            var gateStart = cell.GateStart;
            var gateEnd = cell.GateEnd;
            var power = cell.GatePower;
            var instant = cell.GateIsInstantaneous;
            var caRates = Enumerable.Range(0, gateCount).Select(cell.GateHasCalciumRates).ToArray();
            // Calcium gates: -dt x rate factor x temperature factor for BK-type rates; Hill magnitude, K^m and direction otherwise.
            var bkRateMult = Enumerable.Range(0, gateCount).Select(k => -settings.DtMs * cell.Gates[k].RateFactor * cell.GateTemperatureFactor[k]).ToArray();
            var hill = cell.Gates.Select(gs => Math.Abs(gs.Calcium?.HillCoefficient ?? 1)).ToArray();
            var hillInteger = hill.Select(h => h == Math.Floor(h) && h is >= 1 and <= 8 ? (int)h : 0).ToArray();
            var hillRises = cell.Gates.Select(gs => gs.Calcium?.RisesWithCalcium ?? true).ToArray();
            var kdPow = cell.Gates.Select(gs => gs.Calcium is { } c ? Math.Pow(c.HalfActivationMm, Math.Abs(c.HillCoefficient)) : 0).ToArray();
            var carriesCalcium = cell.Model.Channels.Select(ch => ch.Entry.Ion == Kinetics.Ion.Calcium).ToArray();
            bool anyNernstCalcium = cell.Mode.Any(m => m == DriveMode.NernstCalcium);
            bool anyGhkCalcium = cell.Mode.Any(m => m == DriveMode.GhkCalcium);
            double caThermalMv = Kinetics.Nernst.ThermalVoltageMv(cell.TemperatureC, 2), caOutsideMm = cell.CalciumOutsideMm;
            double vPrevious = previousVoltageMv ?? v;
            bool anySpecial = mode.Any(m => m != DriveMode.Ohmic);
            double cm = cell.CapacitanceUfPerCm2;
            double invRes = 1.0 / RateTable.ResolutionMv;
            int maxIndex = table.Points - 2;
            bool hasShell = cell.HasShell;
            double shellDecay = hasShell ? Math.Exp(-dt / cell.ShellDecayMs) : 0;
            double shellGain = hasShell ? cell.ShellInflowPerCurrent * cell.ShellDecayMs : 0;
            double shellRest = cell.ShellRestMm;

            int every = settings.RecordEvery;
            int samples = every > 0 ? (steps - firstStep) / every + 1 : 0;
            var tRec = new double[samples];
            var vRec = new double[samples];
            var iRec = new double[samples];
            double[][]? currents = every > 0 && settings.RecordCurrents ? Enumerable.Range(0, channelCount).Select(_ => new double[samples]).ToArray() : null;
            double[]? caRec = every > 0 && hasShell ? new double[samples] : null;
            double[]? gatesRec = every > 0 && settings.RecordGateStates ? new double[samples * gateCount] : null;
            var spikes = new List<double>();
            var resumePoints = new List<ResumePoint>();
            bool keepResume = settings.KeepResumePoints;
            var detector = new SpikeDetector(settings.Spikes);
            detector.Feed(firstStep * dt, v, dt);
            var g = new double[channelCount];
            if (every > 0)
            {
                tRec[0] = firstStep * dt;
                vRec[0] = v;
                if (caRec is not null) caRec[0] = ca;
                if (currents is not null) RecordCurrents(cell, currents, 0, v, x, ca);
                if (gatesRec is not null) Array.Copy(x, 0, gatesRec, 0, gateCount);
            }

            for (int s = firstStep; s < steps; s++)
            {
                if ((s & 0xFFF) == 0 && cancel.IsCancellationRequested) cancel.ThrowIfCancellationRequested();
                if (keepResume && s % SimulationSettings.ResumePointEverySteps == 0) resumePoints.Add(new ResumePoint(s, s * dt, new CellState(v, (double[])x.Clone(), ca), vPrevious));
                double pos = (v - RateTable.MinMv) * invRes;
                if (pos < 0) pos = 0;
                else if (pos > maxIndex) pos = maxIndex;
                int i = (int)pos;
                double f = pos - i;
                int j = 2 * i;
                for (int k = 0; k < gateCount; k++)
                {
                    var t = data[k];
                    if (t is null)
                    {
                        double inf, decay;
                        if (caRates[k])
                        {
                            // BK-type: both rates once per step give the steady state and the exact decay for the step.
                            var gate = cell.Gates[k];
                            double vs = v - cell.GateShiftMv[k];
                            double opening = gate.Alpha!.Evaluate(vs, ca), sum = opening + gate.Beta!.Evaluate(vs, ca);
                            inf = opening / sum;
                            decay = Math.Exp(sum * bkRateMult[k]);
                        }
                        else
                        {
                            // Hill gate: ca^m by multiplication for whole coefficients, K^m computed once.
                            double c0 = Math.Max(ca, 0), caPow = hillInteger[k] > 0 ? c0 : Math.Pow(c0, hill[k]);
                            for (int h = 1; h < hillInteger[k]; h++) caPow *= c0;
                            inf = (hillRises[k] ? caPow : kdPow[k]) / (caPow + kdPow[k]);
                            decay = caDecay[k];
                        }
                        x[k] = inf + (x[k] - inf) * decay;
                        continue;
                    }
                    if (instant[k])
                    {
                        // An instantaneous gate must sit at the V of the coming half step, not of this instant:
                        // extrapolate V to t + dt/2 so the scheme stays second order.
                        double pm = (v + 0.5 * (v - vPrevious) - RateTable.MinMv) * invRes;
                        if (pm < 0) pm = 0;
                        else if (pm > maxIndex) pm = maxIndex;
                        int im = (int)pm;
                        x[k] = t[2 * im + 1] + (pm - im) * (t[2 * im + 3] - t[2 * im + 1]);
                        continue;
                    }
                    double a = t[j] + f * (t[j + 2] - t[j]);
                    double b = t[j + 1] + f * (t[j + 3] - t[j + 1]);
                    x[k] = a * x[k] + b;
                }

                double gSum = 0, gE = 0, extra = 0;
                // One Nernst potential of shell calcium per step, shared by every calcium channel and the shell update.
                double eCa = anyNernstCalcium ? caThermalMv * Math.Log(caOutsideMm / Math.Max(ca, 1e-9)) : 0;
                // Likewise one GHK term per step: it depends on V and shell calcium only, not on the channel.
                double ghk = anyGhkCalcium ? cell.CalciumDrivingMv(DriveMode.GhkCalcium, v, ca, eCa) : 0;
                for (int c = 0; c < channelCount; c++)
                {
                    double gc = gbar[c];
                    for (int k = gateStart[c]; k < gateEnd[c]; k++)
                    {
                        double xv = x[k], p = xv;
                        for (int q = 1; q < power[k]; q++) p *= xv;
                        gc *= p;
                    }
                    g[c] = gc;
                    if (!anySpecial || mode[c] == DriveMode.Ohmic)
                    {
                        gSum += gc;
                        gE += gc * erev[c];
                    }
                    else
                    {
                        extra += gc * (mode[c] == DriveMode.GhkCalcium ? ghk : cell.CalciumDrivingMv(mode[c], v, ca, eCa));
                    }
                }
                double iStim = stim is not null ? stim[s] : s >= onFirst && s < onEnd ? onValue : offValue;
                double vOld = v;
                vPrevious = v;
                if (gSum > 1e-12)
                {
                    double vInf = (gE + iStim - extra) / gSum;
                    v = vInf + (v - vInf) * Math.Exp(-dt * gSum / cm);
                }
                else
                {
                    v += dt * (iStim - extra) / cm;
                }

                if (hasShell)
                {
                    double vMid = 0.5 * (v + vOld), ica = 0;
                    double ghkMid = anyGhkCalcium ? cell.CalciumDrivingMv(DriveMode.GhkCalcium, vMid, ca, eCa) : 0;
                    for (int c = 0; c < channelCount; c++)
                        if (carriesCalcium[c])
                            ica += g[c] * mode[c] switch { DriveMode.Ohmic => vMid - erev[c], DriveMode.GhkCalcium => ghkMid, _ => cell.CalciumDrivingMv(mode[c], vMid, ca, eCa) };
                    double caInf = shellRest - shellGain * ica;
                    ca = caInf + (ca - caInf) * shellDecay;
                    if (ca < 0) ca = 0;
                }

                if (!(v > -1000 && v < 1000))
                    throw BlowUp(cell, (s + 1) * dt, vOld, x, ca, iStim);

                double time = (s + 1) * dt;
                double spike = detector.Feed(time, v, dt);
                if (!double.IsNaN(spike))
                {
                    spikes.Add(spike);
                    if (every == 0 && settings.StopAtFirstSpikeAfterMs is { } after && spike >= after) break;
                }

                if (every > 0 && (s + 1 - firstStep) % every == 0)
                {
                    int r = (s + 1 - firstStep) / every;
                    tRec[r] = time;
                    vRec[r] = v;
                    iRec[r] = iStim;
                    if (caRec is not null) caRec[r] = ca;
                    if (currents is not null) RecordCurrents(cell, currents, r, v, x, ca);
                    if (gatesRec is not null) Array.Copy(x, 0, gatesRec, r * gateCount, gateCount);
                }
            }
            var dict = new Dictionary<string, double[]>();
            if (currents is not null)
                for (int c = 0; c < channelCount; c++) dict[UniqueLabel(cell, c, dict)] = currents[c];
            return new Trace
            {
                SampleIntervalMs = every > 0 ? every * dt : 0,
                TimeMs = tRec,
                VoltageMv = vRec,
                StimulusUaPerCm2 = iRec,
                ChannelCurrentsUaPerCm2 = dict,
                CalciumMm = caRec,
                GateStates = gatesRec,
                SpikeTimesMs = spikes,
                ResumePoints = resumePoints,
                FinalState = new CellState(v, x, ca),
                DurationMs = steps * dt,
            };
        }

        private static void RecordCurrents(CompiledCell cell, double[][] currents, int r, double v, double[] x, double ca)
        {
            for (int c = 0; c < cell.ChannelCount; c++) currents[c][r] = cell.ChannelCurrent(c, v, x, ca);
        }
    }

    /// <summary>
    /// Each channel's current density (uA/cm2, outward positive) at one recorded sample of a run made with
    /// <see cref="SimulationSettings.RecordGateStates"/>, in the cell's channel order (labels: <see cref="ChannelLabels"/>).
    /// </summary>
    public static double[] ChannelCurrentsAt(CompiledCell cell, Trace trace, int sample)
    {
        var states = trace.GateStates ?? throw new ArgumentException("the run did not record gate states (SimulationSettings.RecordGateStates)", nameof(trace));
        var x = new double[cell.GateCount];
        Array.Copy(states, sample * cell.GateCount, x, 0, cell.GateCount);
        double v = trace.VoltageMv[sample];
        double ca = trace.CalciumMm?[sample] ?? trace.FinalState.CalciumMm;
        var i = new double[cell.ChannelCount];
        for (int c = 0; c < cell.ChannelCount; c++) i[c] = cell.ChannelCurrent(c, v, x, ca);
        return i;
    }

    /// <summary>One label per channel, in the cell's order: the entry id, with "#2", "#3" for repeats (as the recorded currents use).</summary>
    public static IReadOnlyList<string> ChannelLabels(CompiledCell cell)
    {
        var taken = new Dictionary<string, double[]>();
        var labels = new List<string>();
        for (int c = 0; c < cell.ChannelCount; c++)
        {
            var label = UniqueLabel(cell, c, taken);
            taken[label] = [];
            labels.Add(label);
        }
        return labels;
    }

    internal static string UniqueLabel(CompiledCell cell, int c, IReadOnlyDictionary<string, double[]> taken)
    {
        string id = cell.Model.Channels[c].Entry.Id;
        if (!taken.ContainsKey(id)) return id;
        int n = 2;
        while (taken.ContainsKey($"{id}#{n}")) n++;
        return $"{id}#{n}";
    }

    internal static SimulationBlowUpException BlowUp(CompiledCell cell, double timeMs, double vBefore, double[] x, double ca, double iStim)
    {
        string worst = "(none)";
        double worstI = 0;
        for (int c = 0; c < cell.ChannelCount; c++)
        {
            double i = Math.Abs(cell.ChannelCurrent(c, vBefore, x, ca));
            if (double.IsNaN(i) || i > worstI) { worstI = double.IsNaN(i) ? double.PositiveInfinity : i; worst = cell.Model.Channels[c].Entry.Key; }
        }
        var state = new CellState(vBefore, (double[])x.Clone(), ca);
        return new SimulationBlowUpException(
            $"Simulation left the physical range at t = {timeMs:F3} ms (V before the step {vBefore:G4} mV, stimulus {iStim:G4} uA/cm2); " +
            $"largest current from channel {worst} ({worstI:G4} uA/cm2). Check that channel's density and the stimulus amplitude.",
            timeMs, worst, state);
    }
}
