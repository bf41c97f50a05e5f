namespace ExprModel.Core.Simulation;

/// <summary>
/// The fast fixed-step integrator. Gates live at half steps and V at whole steps (a staggered scheme):
/// each gate takes the exact exponential update for the V of the step's midpoint from a rate table, then V
/// takes the exact exponential update of the linear membrane equation with conductances frozen at their
/// midpoint values. Both updates are unconditionally stable, and staggering makes the scheme second order.
/// Sweeps run one lane per stimulus, in parallel over the machine's cores: four at a time in the SIMD kernel
/// (<see cref="SweepKernel"/>) where the CPU has AVX2 and FMA, else one each in the scalar loop (<see cref="ScalarLoop"/>);
/// recorded runs use the scalar loop. Both read the cell's <see cref="StepPlan"/>.
/// </summary>
public static class Simulator
{
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

    private static readonly AsyncLocal<bool> OneCorePerCall = new();

    /// <summary>
    /// Whether a sweep spreads its SIMD groups (and the read-outs their side runs) over the machine's cores; true unless
    /// the caller already keeps every core busy with calls of its own, as a batch over many cells does. There the inner
    /// spreading only adds threads that wait on each other. Results never depend on it: lanes never mix, and the groups
    /// are the same either way. Per logical call flow, like <see cref="UseSimd"/>.
    /// </summary>
    internal static bool SpreadOverCores
    {
        get => !OneCorePerCall.Value;
        set => OneCorePerCall.Value = !value;
    }

    /// <summary>
    /// Runs <paramref name="body"/> for every item in parallel over the cores. When the items alone fill the cores (at least
    /// two per core, so the last ones do not leave a core idle for long), each item's sweeps stay on its own thread
    /// (<see cref="SpreadOverCores"/> false for the item, restored afterwards: the body may run on the caller's thread).
    /// </summary>
    internal static void ForEachItem(int count, CancellationToken cancel, Action<int> body)
    {
        bool fill = count >= 2 * Environment.ProcessorCount;
        Parallel.For(0, count, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount, CancellationToken = cancel }, i =>
        {
            bool spread = SpreadOverCores;
            if (fill) SpreadOverCores = false;
            try
            {
                body(i);
            }
            finally
            {
                SpreadOverCores = spread;
            }
        });
    }

    /// <summary>The rate tables for this step size, kept with the cell's kinetics (so shared by cells that differ only in densities).</summary>
    internal static RateTable TableFor(CompiledCell cell, double dtMs) => cell.Kinetics.TableFor(dtMs);

    /// <summary>Runs one current-clamp simulation and records the trace.</summary>
    public static Trace Run(CompiledCell cell, Stimulus stimulus, double durationMs, SimulationSettings? settings = null,
        CellState? initial = null, CancellationToken cancel = default)
    {
        settings ??= SimulationSettings.Default;
        Validate(durationMs, settings);
        int steps = (int)Math.Round(durationMs / settings.DtMs);
        return ScalarLoop.Run(cell, TableFor(cell, settings.DtMs), stimulus, steps, settings, initial ?? cell.InitialState(), cancel);
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
    public static Trace Resume(CompiledCell cell, Stimulus stimulus, ResumePoint from, double untilMs, SimulationSettings? settings = null,
        CancellationToken cancel = default)
    {
        settings ??= SimulationSettings.Default;
        Validate(untilMs, settings);
        int steps = (int)Math.Round(untilMs / settings.DtMs);
        if (from.Step < 0 || from.Step >= steps)
            throw new ArgumentOutOfRangeException(nameof(from), $"the resume point (step {from.Step}) must lie before the end of the run (step {steps})");
        return ScalarLoop.Run(cell, TableFor(cell, settings.DtMs), stimulus, steps, settings, from.State, cancel, from.Step, from.PreviousVoltageMv);
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
        var options = new ParallelOptions { CancellationToken = cancel, MaxDegreeOfParallelism = SpreadOverCores ? Environment.ProcessorCount : 1 };
        if (SweepKernel.CanRun(cell) && UseSimd)
        {
            int width = SweepKernel.Width;
            int groups = (stimuli.Count + width - 1) / width;
            var from = initial is null ? null : SweepBaselines.For(cell, table, stimuli, steps, settings, initial, cancel);
            Parallel.For(0, groups, options, gi =>
            {
                int first = gi * width, count = Math.Min(width, stimuli.Count - first);
                var stims = Enumerable.Range(first, count).Select(i => stimuli[i]).ToArray();
                var lanes = SweepKernel.Run(cell, table, stims, steps, settings, start, resumeMarginMs, cancel, from);
                for (int l = 0; l < count; l++) result[first + l] = lanes[l];
            });
            return result;
        }
        Parallel.For(0, stimuli.Count, options, i =>
        {
            result[i] = new SweepLane(ScalarLoop.Run(cell, table, stimuli[i], steps, settings, start, cancel).SpikeTimesMs, null);
        });
        return result;
    }

    private static void Validate(double durationMs, SimulationSettings s)
    {
        if (!(s.DtMs > 0) || s.DtMs > 1) throw new ArgumentOutOfRangeException(nameof(s), $"dtMs must lie in (0, 1] ms (got {s.DtMs}).");
        if (!(durationMs > 0) || durationMs > 600_000)
            throw new ArgumentOutOfRangeException(nameof(durationMs), $"durationMs must lie in (0, 600000] (got {durationMs}).");
        if (s.RecordEvery < 0) throw new ArgumentOutOfRangeException(nameof(s), "recordEvery must be >= 0.");
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
