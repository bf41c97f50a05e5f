using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The sweep hot loop with four stimuli as SIMD lanes (AVX2 loads from the rate tables, FMA, inlined exp). Same staggered scheme and the same
/// spike rule as the scalar loop, so results agree with it to rounding. Handles voltage gates from tables, calcium- and sodium-gated (Hill)
/// gates, calcium channels with a Nernst or GHK driving force and the calcium and sodium shells, exactly as the scalar loop orders them. What
/// each gate and channel needs comes from the cell's <see cref="StepPlan"/> (broadcast once in <see cref="SweepCoefficients"/>); the gate
/// updates are <see cref="SweepGates"/>, the shells <see cref="SweepShells"/>, spike detection <see cref="SweepSpikeWatch"/> and the
/// resume-point ring <see cref="SweepCheckpoints"/>. Lanes never mix: each lane's numbers are what a sweep of that stimulus alone gives.
/// </summary>
internal static unsafe class SweepKernel
{
    public const int Width = 4;

    /// <summary>Integration steps between the snapshots kept for resume points.</summary>
    public const int CheckpointEverySteps = SimulationSettings.ResumePointEverySteps;

    /// <summary>True when the CPU has AVX2 and FMA and every calcium-rate gate uses the calcium-bound shapes evaluated here.</summary>
    public static bool CanRun(CompiledCell cell) => Avx2.IsSupported && Fma.IsSupported && cell.Plan.CalciumRatesAreBound;

    /// <summary>
    /// Runs up to <c>Vector256<double>.Count</c> stimuli (each a step, or sampled per step) from the same initial state; returns each
    /// lane's spike times. With <paramref name="resumeMarginMs"/>, also a resume point at least that long before each
    /// lane's first spike (taken from snapshots every <see cref="CheckpointEverySteps"/> steps; null when
    /// the lane crossed the detection level before its first counted spike, or no snapshot is early enough).
    /// </summary>
    /// <param name="from">A shared baseline to start at (<see cref="Baseline"/>, taken from <paramref name="init"/> with these settings and
    /// ending before any lane's stimulus departs from zero); null starts at step 0.</param>
    public static SweepLane[] Run(CompiledCell cell, RateTable table, IReadOnlyList<Stimulus> stimuli, int steps, SimulationSettings settings, CellState init,
        double? resumeMarginMs, CancellationToken cancel, SweepStart? from = null) =>
        Run(cell, table, stimuli, steps, settings, init, resumeMarginMs, cancel, from, out _);

    /// <summary>
    /// The state after <paramref name="steps"/> steps at zero current from <paramref name="init"/>, to start sweeps from
    /// (<see cref="SweepStart"/>); null when a lane crossed the spike detection level on the way (a sweep must then run
    /// its detector from the beginning) or the membrane left the physical range.
    /// </summary>
    public static SweepStart? Baseline(CompiledCell cell, RateTable table, int steps, SimulationSettings settings, CellState init, CancellationToken cancel)
    {
        try
        {
            Run(cell, table, [new NoCurrent()], steps, settings, init, null, cancel, null, out var end);
            return end;
        }
        catch (SimulationBlowUpException)
        {
            return null;
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static SweepLane[] Run(CompiledCell cell, RateTable table, IReadOnlyList<Stimulus> stimuli, int steps, SimulationSettings settings, CellState init,
        double? resumeMarginMs, CancellationToken cancel, SweepStart? from, out SweepStart? end)
    {
        // Without resume margin and with a single no-current lane this run is a baseline: it keeps the ring and hands back its end state.
        bool baseline = resumeMarginMs is null && stimuli.Count == 1 && stimuli[0] is NoCurrent && from is null;
        int lanes = stimuli.Count;
        if (lanes < 1 || lanes > Width) throw new ArgumentOutOfRangeException(nameof(stimuli));
        double dt = settings.DtMs;
        var k = new SweepCoefficients(cell, table, dt);
        int gates = k.Gates, channels = k.Channels;
        // Steps (the f-I protocol) are computed inline from their on-range; anything else is sampled per step.
        bool allSteps = stimuli.All(x => x is StepCurrent or NoCurrent);
        double[] stim = allSteps ? [] : Sampled(stimuli, dt, steps);
        var (onFirstV, onEndV, onValueV, offValueV) = allSteps ? StepRanges(stimuli, dt, steps) : default;
        var quads = table.QuadPointers();
        var xs = new Vector256<double>[gates];
        for (int g = 0; g < gates; g++) xs[g] = from is null ? Vector256.Create(init.Gates[g]) : from.Gates[g];
        // The plan's arrays in locals: the JIT keeps fields of an object live in the loop poorly.
        var gbar = k.Gbar;
        var erev = k.ErevMv;
        var gateStart = k.GateStart;
        var gateEnd = k.GateEnd;
        var power = k.GatePower;
        var mode = k.Mode;
        bool anySpecial = k.AnyNonOhmic, anyNernst = k.AnyNernst, anyGhk = k.AnyGhk;
        int tableCount = k.TableGates.Length, instantCount = k.InstantaneousGates.Length;
        bool anyConcentrationGated = k.HillGates.Length + k.CalciumRateGates.Length > 0;
        var calciumCarriers = k.CalciumCarriers;
        var sodiumCarriers = k.SodiumCarriers;
        bool hasShell = cell.HasShell;
        var caOut = Vector256.Create(cell.CalciumOutsideMm);
        double vt2 = Kinetics.Nernst.ThermalVoltageMv(cell.TemperatureC, 2);
        var vt2v = Vector256.Create(vt2);
        var invVt2 = Vector256.Create(1 / vt2);
        var caFloor = Vector256.Create(1e-9);
        var shellDecay = Vector256.Create(hasShell ? Math.Exp(-dt / cell.ShellDecayMs) : 0);
        var shellGain = Vector256.Create(hasShell ? cell.ShellInflowPerCurrent * cell.ShellDecayMs : 0);
        var shellRest = Vector256.Create(cell.ShellRestMm);
        var ca = from?.CalciumMm ?? Vector256.Create(init.CalciumMm);
        // The sodium shell (KNa), as the scalar loop keeps it.
        bool hasSodiumShell = cell.HasSodiumShell;
        var sodiumDecay = Vector256.Create(hasSodiumShell ? Math.Exp(-dt / cell.SodiumShellDecayMs) : 0);
        var sodiumGain = Vector256.Create(hasSodiumShell ? cell.SodiumInflowPerCurrent * cell.SodiumShellDecayMs : 0);
        var sodiumRest = Vector256.Create(cell.SodiumShellRestMm);
        var na = from?.SodiumMm ?? Vector256.Create(double.IsNaN(init.SodiumMm) ? cell.SodiumShellRestMm : init.SodiumMm);
        var gcs = new Vector256<double>[channels];
        var v = from?.VoltageMv ?? Vector256.Create(init.VoltageMv);
        var vPrev = from?.PreviousVoltageMv ?? v;
        var vMin = Vector256.Create(RateTable.MinMv);
        var invRes = Vector256.Create(1.0 / RateTable.ResolutionMv);
        var zero = Vector256.Create(0.0);
        var maxPos = Vector256.Create((double)(table.Points - 2));
        var half = Vector256.Create(0.5);
        var minusDtOverC = Vector256.Create(-dt / cell.CapacitanceUfPerCm2);
        var dtOverC = Vector256.Create(dt / cell.CapacitanceUfPerCm2);
        var tiny = Vector256.Create(1e-12);
        var limit = Vector256.Create(1000.0);
        var level = Vector256.Create(settings.Spikes.LevelMv);

        // Resume points: a ring of whole-pack snapshots every CheckpointEverySteps steps (kept by a baseline too, to hand on).
        bool keepResume = resumeMarginMs is not null || baseline;
        var checkpoints = keepResume ? new SweepCheckpoints(gates, from) : null;
        var watch = new SweepSpikeWatch(lanes, settings, resumeMarginMs is { } margin ? (int)Math.Ceiling(margin / dt) : 0, checkpoints);

        int firstStep = from?.Step ?? 0;
        int stepsRun = steps - firstStep;
        fixed (double* S = stim)
        fixed (Vector256<double>* x = xs)
        fixed (int* tableGates = k.TableGates, instantGates = k.InstantaneousGates)
        fixed (double** q = quads)
        {
            for (int s = firstStep; s < steps; s++)
            {
                if ((s & 0xFFF) == 0 && cancel.IsCancellationRequested) cancel.ThrowIfCancellationRequested();
                if (keepResume && s % CheckpointEverySteps == 0) checkpoints!.Take(s, xs, v, vPrev, ca, na);
                SweepGates.Locate(v, vMin, invRes, maxPos, out long i0, out long i1, out long i2, out long i3, out var f02, out var f13);
                SweepGates.AdvanceTabulated(x, tableGates, tableCount, q, i0, i1, i2, i3, f02, f13);
                if (instantCount > 0)
                {
                    // Instantaneous gates follow V extrapolated to the half step.
                    SweepGates.Locate(Fma.MultiplyAdd(half, v - vPrev, v), vMin, invRes, maxPos, out long m0, out long m1, out long m2, out long m3,
                        out var fm02, out var fm13);
                    SweepGates.SetInstantaneous(x, instantGates, instantCount, q, m0, m1, m2, m3, fm02, fm13);
                }
                if (anyConcentrationGated) SweepGates.AdvanceConcentrationGated(x, k, v, ca, na);
                var gSum = zero;
                var gE = zero;
                var extra = zero;
                // The driving term of a calcium channel depends only on its mode, V and shell calcium, so each mode's
                // term is computed once per step for every channel that uses it. The Nernst potential of shell calcium
                // (one logarithm) serves this step's currents and the shell update alike.
                var eCa = anyNernst ? vt2v * InlineLog.Log(caOut / Vector256.Max(ca, caFloor)) : zero;
                var drivingGhk = anyGhk ? SweepShells.GhkDrivingMv(v, ca, caOut, vt2v, invVt2) : zero;
                for (int c = 0; c < channels; c++)
                {
                    var gc = StepPlan.Conductance<VectorLanes, Vector256<double>>(gbar[c], xs, gateStart[c], gateEnd[c], power);
                    gcs[c] = gc;
                    if (!anySpecial || mode[c] == DriveMode.Ohmic)
                    {
                        gSum += gc;
                        gE = Fma.MultiplyAdd(gc, erev[c], gE);
                    }
                    else
                    {
                        extra = Fma.MultiplyAdd(gc, mode[c] == DriveMode.NernstCalcium ? v - eCa : drivingGhk, extra);
                    }
                }
                Vector256<double> current = allSteps
                    ? Vector256.ConditionalSelect(
                        Vector256.GreaterThanOrEqual(Vector256.Create((double)s), onFirstV) & Vector256.LessThan(Vector256.Create((double)s), onEndV),
                        onValueV, offValueV)
                    : Vector256.Create(new ReadOnlySpan<double>(S + (long)s * Width, Width));
                vPrev = v;
                var drive = gE + current - extra;
                var vInf = drive / Vector256.Max(gSum, tiny);
                var relaxed = Fma.MultiplyAdd(v - vInf, InlineExp.Exp(gSum * minusDtOverC), vInf);
                var euler = Fma.MultiplyAdd(dtOverC, drive - gSum * v, v);
                v = Vector256.ConditionalSelect(Vector256.GreaterThan(gSum, tiny), relaxed, euler);

                if (hasShell)
                    ca = SweepShells.Calcium(ca, (v + vPrev) * half, gcs, calciumCarriers, mode, erev, eCa, anyGhk, caOut, vt2v, invVt2,
                        shellRest, shellGain, shellDecay);
                if (hasSodiumShell)
                    na = SweepShells.Sodium(na, (v + vPrev) * half, gcs, sodiumCarriers, erev, sodiumRest, sodiumGain, sodiumDecay);

                if (!Vector256.LessThanAll(Vector256.Abs(v), limit))
                {
                    for (int l = 0; l < lanes; l++)
                        if (!(Math.Abs(v[l]) < 1000))
                            throw Simulator.BlowUp(cell, (s + 1) * dt, vPrev[l], xs.Select(xx => xx[l]).ToArray(), ca[l], current[l]);
                }

                bool nearSpike = watch.AnyPending || Vector256.GreaterThanOrEqualAny(v, level) || Vector256.GreaterThanOrEqualAny(vPrev, level);
                if (nearSpike && watch.Observe(s, v, vPrev))
                {
                    stepsRun = s + 1 - firstStep;
                    break;
                }
            }
        }
        StepCounters.AddSimd(stepsRun, lanes);
        end = baseline && watch.NeverCrossed ? checkpoints!.Start(steps, xs, v, vPrev, ca, na) : null;
        return watch.Lanes();
    }

    /// <summary>Per lane of a sweep of steps: first step on, first step off, current while on and while off (lanes past the last repeat lane 0).</summary>
    private static (Vector256<double> OnFirst, Vector256<double> OnEnd, Vector256<double> OnValue, Vector256<double> OffValue) StepRanges(
        IReadOnlyList<Stimulus> stimuli, double dt, int steps)
    {
        var onFirst = new double[Width];
        var onEnd = new double[Width];
        var onValue = new double[Width];
        var offValue = new double[Width];
        for (int l = 0; l < Width; l++)
        {
            if (stimuli[l < stimuli.Count ? l : 0] is not StepCurrent sc) continue;
            var (a, b) = sc.OnRange(dt, steps);
            (onFirst[l], onEnd[l], onValue[l], offValue[l]) = (a, b, sc.HoldingUaPerCm2 + sc.AmplitudeUaPerCm2, sc.HoldingUaPerCm2);
        }
        return (Vector256.Create(onFirst), Vector256.Create(onEnd), Vector256.Create(onValue), Vector256.Create(offValue));
    }

    /// <summary>Every stimulus sampled per step, lane-interleaved ([step * Width + lane]; lanes past the last repeat lane 0).</summary>
    private static double[] Sampled(IReadOnlyList<Stimulus> stimuli, double dt, int steps)
    {
        var stim = new double[steps * Width];
        for (int l = 0; l < Width; l++)
        {
            var sampled = stimuli[l < stimuli.Count ? l : 0].Sample(dt, steps);
            for (int s = 0; s < steps; s++) stim[s * Width + l] = sampled[s];
        }
        return stim;
    }
}
