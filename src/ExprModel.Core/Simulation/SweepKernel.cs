using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The sweep hot loop with four stimuli as SIMD lanes (AVX2 gathers from the rate tables, FMA, vector exp). Same staggered scheme and the same spike rule as
/// the scalar loop, so results agree with it to rounding. Handles voltage gates from tables, calcium- and sodium-gated (Hill) gates,
/// calcium channels with a Nernst or GHK driving force and the calcium and sodium shells, exactly as the scalar loop orders them. What each
/// gate and channel needs comes from the cell's <see cref="StepPlan"/>; the shared formulas run here on <see cref="VectorLanes"/>.
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
        const int width = Width;
        int lanes = stimuli.Count;
        if (lanes < 1 || lanes > width) throw new ArgumentOutOfRangeException(nameof(stimuli));
        int gates = cell.GateCount, channels = cell.ChannelCount;
        double dt = settings.DtMs;
        // Steps (the f-I protocol) are computed inline from their on-range; anything else is sampled per step.
        bool allSteps = stimuli.All(x => x is StepCurrent or NoCurrent);
        double[] stim = allSteps ? [] : new double[steps * width];
        var onFirst = new double[width];
        var onEnd = new double[width];
        var onValue = new double[width];
        var offValue = new double[width];
        for (int l = 0; l < width; l++)
        {
            var st = stimuli[l < lanes ? l : 0];
            if (allSteps)
            {
                if (st is StepCurrent sc)
                {
                    var (a, b) = sc.OnRange(dt, steps);
                    (onFirst[l], onEnd[l], onValue[l], offValue[l]) = (a, b, sc.HoldingUaPerCm2 + sc.AmplitudeUaPerCm2, sc.HoldingUaPerCm2);
                }
                continue;
            }
            var sampled = st.Sample(dt, steps);
            for (int s = 0; s < steps; s++) stim[s * width + l] = sampled[s];
        }
        var onFirstV = Vector256.Create(onFirst);
        var onEndV = Vector256.Create(onEnd);
        var onValueV = Vector256.Create(onValue);
        var offValueV = Vector256.Create(offValue);
        var quads = table.QuadPointers();
        var x = new Vector256<double>[gates];
        for (int g = 0; g < gates; g++) x[g] = from is null ? Vector256.Create(init.Gates[g]) : from.Gates[g];
        // Everything per gate and channel comes from the cell's step plan; only the broadcasts are made here.
        var plan = cell.Plan;
        var gbar = cell.Gbar.Select(Vector256.Create).ToArray();
        var erev = plan.ErevMv.Select(Vector256.Create).ToArray();
        var update = plan.Update;
        var gateStart = plan.GateStart;
        var gateEnd = plan.GateEnd;
        var power = plan.GatePower;
        bool anyInstant = plan.AnyInstantaneous;
        // Calcium-bound (BK-type) rates and Hill constants, broadcast once from the plan.
        var opens = plan.BoundOpening.Select(r => r.Opens).ToArray();
        var openA = plan.BoundOpening.Select(r => Vector256.Create(r.MaxRatePerMs)).ToArray();
        var openC1 = plan.BoundOpening.Select(r => Vector256.Create(r.DissociationAtZeroMm)).ToArray();
        var openK = plan.BoundOpening.Select(r => Vector256.Create(r.MinusInverseKPerMv)).ToArray();
        var closes = plan.BoundClosing.Select(r => r.Opens).ToArray();
        var closeA = plan.BoundClosing.Select(r => Vector256.Create(r.MaxRatePerMs)).ToArray();
        var closeC1 = plan.BoundClosing.Select(r => Vector256.Create(r.DissociationAtZeroMm)).ToArray();
        var closeK = plan.BoundClosing.Select(r => Vector256.Create(r.MinusInverseKPerMv)).ToArray();
        var hillWhole = plan.HillWholePower;
        var hillV = plan.HillMagnitude.Select(Vector256.Create).ToArray();
        var hillHalfPower = plan.HillHalfPower.Select(Vector256.Create).ToArray();
        var hillRises = plan.HillRises;
        var shiftV = plan.GateShiftMv.Select(Vector256.Create).ToArray();
        // exp(-dt * (alpha + beta) * rateFactor * temperature factor): the same tau the scalar loop takes.
        var rateMult = Enumerable.Range(0, gates).Select(g => Vector256.Create(plan.CalciumRateExponent(g, dt))).ToArray();
        var caDecay = table.CalciumDecay.Select(Vector256.Create).ToArray();
        var mode = plan.Mode;
        bool anySpecial = plan.AnyNonOhmic;
        bool anyNernst = plan.AnyNernstCalcium, anyGhk = plan.AnyGhkCalcium;
        var carriesCalcium = plan.CarriesCalcium;
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
        var carriesSodium = plan.CarriesSodium;
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
        double levelMv = settings.Spikes.LevelMv, refractory = settings.Spikes.RefractoryMs, maxWidth = settings.Spikes.MaxWidthMs;

        var spikes = new List<double>[lanes];
        for (int l = 0; l < lanes; l++) spikes[l] = [];
        var pending = new double[width];
        var lastCross = new double[width];
        Array.Fill(pending, double.NaN);
        Array.Fill(lastCross, double.NegativeInfinity);
        bool anyPending = false;
        double? stopAfter = settings.StopAtFirstSpikeAfterMs;
        var doneLane = new bool[width];
        int lanesDone = 0;

        // Resume points: a ring of whole-pack snapshots every CheckpointEverySteps steps; at a lane's first crossing the
        // newest snapshot at least the margin earlier becomes its candidate, kept if that crossing is its first counted spike.
        const int ring = 4;
        bool keepResume = resumeMarginMs is not null || baseline;
        int marginSteps = resumeMarginMs is { } margin ? (int)Math.Ceiling(margin / dt) : 0;
        var ckX = keepResume ? new Vector256<double>[ring * gates] : [];
        var ckV = new Vector256<double>[ring];
        var ckVPrev = new Vector256<double>[ring];
        var ckCa = new Vector256<double>[ring];
        var ckNa = new Vector256<double>[ring];
        var ckStep = new int[ring];
        Array.Fill(ckStep, -1);
        if (from is not null && keepResume)
        {
            from.RingStep.CopyTo(ckStep, 0);
            from.RingVoltageMv.CopyTo(ckV, 0);
            from.RingPreviousVoltageMv.CopyTo(ckVPrev, 0);
            from.RingCalciumMm.CopyTo(ckCa, 0);
            from.RingSodiumMm.CopyTo(ckNa, 0);
            from.RingGates.CopyTo(ckX, 0);
        }
        var crossed = new bool[width];
        var candidate = new ResumePoint?[width];
        var firstCrossTime = new double[width];
        var resume = new ResumePoint?[lanes];
        double resumeAfter = stopAfter ?? 0;

        int firstStep = from?.Step ?? 0;
        int stepsRun = steps - firstStep;
        fixed (double* S = stim)
        {
            for (int s = firstStep; s < steps; s++)
            {
                if ((s & 0xFFF) == 0 && cancel.IsCancellationRequested) cancel.ThrowIfCancellationRequested();
                if (keepResume && s % CheckpointEverySteps == 0)
                {
                    int slot = s / CheckpointEverySteps % ring;
                    ckStep[slot] = s;
                    ckV[slot] = v;
                    ckVPrev[slot] = vPrev;
                    ckCa[slot] = ca;
                    ckNa[slot] = na;
                    Array.Copy(x, 0, ckX, slot * gates, gates);
                }
                var pos = Vector256.Min(Vector256.Max((v - vMin) * invRes, zero), maxPos);
                var fl = Vector256.Floor(pos);
                var f = pos - fl;
                var idx = Avx.ConvertToVector128Int32WithTruncation(fl);
                long i0 = 4L * idx.GetElement(0), i1 = 4L * idx.GetElement(1), i2 = 4L * idx.GetElement(2), i3 = 4L * idx.GetElement(3);
                long m0 = 0, m1 = 0, m2 = 0, m3 = 0;
                Vector256<double> fMid = default;
                if (anyInstant)
                {
                    var pm = Vector256.Min(Vector256.Max((Fma.MultiplyAdd(half, v - vPrev, v) - vMin) * invRes, zero), maxPos);
                    var flm = Vector256.Floor(pm);
                    fMid = pm - flm;
                    var im = Avx.ConvertToVector128Int32WithTruncation(flm);
                    m0 = 4L * im.GetElement(0); m1 = 4L * im.GetElement(1); m2 = 4L * im.GetElement(2); m3 = 4L * im.GetElement(3);
                }
                for (int g = 0; g < gates; g++)
                {
                    var kind = update[g];
                    if (kind > GateUpdate.TableInstantaneous)
                    {
                        if (kind != GateUpdate.CalciumRates)
                        {
                            // Hill steady state of a calcium- or sodium-gated subunit; constant time constant.
                            var hill = StepPlan.HillSteadyState<VectorLanes, Vector256<double>>(kind == GateUpdate.SodiumHill ? na : ca, hillWhole[g], hillV[g],
                                hillHalfPower[g], hillRises[g]);
                            x[g] = Fma.MultiplyAdd(x[g] - hill, caDecay[g], hill);
                            continue;
                        }
                        // BK-type: rates depend on V (with the channel's shift) and calcium; exact update for the step.
                        var vs = v - shiftV[g];
                        var opening = CalciumBoundRate.Evaluate(opens[g], openA[g], openC1[g], openK[g], vs, ca);
                        var closing = CalciumBoundRate.Evaluate(closes[g], closeA[g], closeC1[g], closeK[g], vs, ca);
                        var sum = opening + closing;
                        var inf = opening / sum;
                        x[g] = Fma.MultiplyAdd(x[g] - inf, InlineExp.Exp(sum * rateMult[g]), inf);
                        continue;
                    }
                    double* q = quads[g];
                    bool mid = kind == GateUpdate.TableInstantaneous;
                    var r0 = Avx.LoadVector256(q + (mid ? m0 : i0));
                    var r1 = Avx.LoadVector256(q + (mid ? m1 : i1));
                    var r2 = Avx.LoadVector256(q + (mid ? m2 : i2));
                    var r3 = Avx.LoadVector256(q + (mid ? m3 : i3));
                    // 4x4 transpose: lanes' [decay, drive, d_decay, d_drive] into four vectors across lanes.
                    var t0 = Avx.UnpackLow(r0, r1);
                    var t1 = Avx.UnpackHigh(r0, r1);
                    var t2 = Avx.UnpackLow(r2, r3);
                    var t3 = Avx.UnpackHigh(r2, r3);
                    var decay0 = Avx.Permute2x128(t0, t2, 0x20);
                    var dDecay = Avx.Permute2x128(t0, t2, 0x31);
                    var drive0 = Avx.Permute2x128(t1, t3, 0x20);
                    var dDrive = Avx.Permute2x128(t1, t3, 0x31);
                    if (mid)
                    {
                        x[g] = Fma.MultiplyAdd(fMid, dDrive, drive0);
                        continue;
                    }
                    var a = Fma.MultiplyAdd(f, dDecay, decay0);
                    var b = Fma.MultiplyAdd(f, dDrive, drive0);
                    x[g] = Fma.MultiplyAdd(a, x[g], b);
                }
                var gSum = zero;
                var gE = zero;
                var extra = zero;
                // The driving term of a calcium channel depends only on its mode, V and shell calcium, so each mode's
                // term is computed once per step for every channel that uses it. The Nernst potential of shell calcium
                // (one logarithm) serves this step's currents and the shell update alike.
                var eCa = anyNernst ? vt2v * InlineLog.Log(caOut / Vector256.Max(ca, caFloor)) : zero;
                var drivingGhk = anyGhk ? Ghk(v, ca, caOut, vt2v, invVt2) : zero;
                for (int c = 0; c < channels; c++)
                {
                    var gc = StepPlan.Conductance<VectorLanes, Vector256<double>>(gbar[c], x, gateStart[c], gateEnd[c], power);
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
                    : Vector256.Create(new ReadOnlySpan<double>(S + (long)s * width, width));
                vPrev = v;
                var drive = gE + current - extra;
                var vInf = drive / Vector256.Max(gSum, tiny);
                var relaxed = Fma.MultiplyAdd(v - vInf, InlineExp.Exp(gSum * minusDtOverC), vInf);
                var euler = Fma.MultiplyAdd(dtOverC, drive - gSum * v, v);
                v = Vector256.ConditionalSelect(Vector256.GreaterThan(gSum, tiny), relaxed, euler);

                if (hasShell)
                {
                    var vMid = (v + vPrev) * half;
                    var ica = zero;
                    var ghkMid = anyGhk ? Ghk(vMid, ca, caOut, vt2v, invVt2) : zero;
                    for (int c = 0; c < channels; c++)
                        if (carriesCalcium[c]) ica = Fma.MultiplyAdd(gcs[c],
                            mode[c] switch { DriveMode.Ohmic => vMid - erev[c], DriveMode.NernstCalcium => vMid - eCa, _ => ghkMid }, ica);
                    var caInf = shellRest - shellGain * ica;
                    ca = Vector256.Max(Fma.MultiplyAdd(ca - caInf, shellDecay, caInf), zero);
                }

                if (hasSodiumShell)
                {
                    var vMid = (v + vPrev) * half;
                    var ina = zero;
                    for (int c = 0; c < channels; c++)
                        if (carriesSodium[c]) ina = Fma.MultiplyAdd(gcs[c], vMid - erev[c], ina);
                    var naInf = sodiumRest - sodiumGain * ina;
                    na = Vector256.Max(Fma.MultiplyAdd(na - naInf, sodiumDecay, naInf), zero);
                }

                if (!Vector256.LessThanAll(Vector256.Abs(v), limit))
                {
                    for (int l = 0; l < lanes; l++)
                        if (!(Math.Abs(v[l]) < 1000))
                            throw Simulator.BlowUp(cell, (s + 1) * dt, vPrev[l], x.Select(xx => xx[l]).ToArray(), ca[l], current[l]);
                }

                if (anyPending || Vector256.GreaterThanOrEqualAny(v, level) || Vector256.GreaterThanOrEqualAny(vPrev, level))
                {
                    double t = (s + 1) * dt;
                    anyPending = false;
                    for (int l = 0; l < lanes; l++)
                    {
                        double vl = v[l], vp = vPrev[l];
                        if (!double.IsNaN(pending[l]))
                        {
                            if (vl < levelMv)
                            {
                                if (keepResume && spikes[l].Count == 0 && pending[l] == firstCrossTime[l] && pending[l] >= resumeAfter)
                                    resume[l] = candidate[l];
                                spikes[l].Add(pending[l]);
                                if (stopAfter is { } after && pending[l] >= after && !doneLane[l]) { doneLane[l] = true; lanesDone++; }
                                pending[l] = double.NaN;
                            }
                            else if (t - pending[l] > maxWidth) pending[l] = double.NaN;
                        }
                        // Armed at an upward crossing iff the previous sample was below the level at least one
                        // refractory period after the last crossing (the scalar detector's rule, evaluated lazily).
                        if (vp < levelMv && vl >= levelMv && double.IsNaN(pending[l]) && (t - dt) - lastCross[l] >= refractory)
                        {
                            pending[l] = t - dt + (levelMv - vp) / (vl - vp) * dt;
                            lastCross[l] = pending[l];
                            if (keepResume && !crossed[l])
                            {
                                crossed[l] = true;
                                firstCrossTime[l] = pending[l];
                                candidate[l] = Snapshot(l, (int)Math.Floor(pending[l] / dt) - marginSteps, ckStep, ckX, ckV, ckVPrev, ckCa, ckNa, gates, dt);
                            }
                        }
                        if (!double.IsNaN(pending[l])) anyPending = true;
                    }
                    if (lanesDone == lanes)
                    {
                        stepsRun = s + 1 - firstStep;
                        break;
                    }
                }
            }
        }
        StepCounters.AddSimd(stepsRun);
        end = baseline && !crossed.Any(c => c) && lastCross.All(double.IsNegativeInfinity) && pending.All(double.IsNaN)
            ? new SweepStart
            {
                Step = steps,
                Gates = x,
                VoltageMv = v,
                PreviousVoltageMv = vPrev,
                CalciumMm = ca,
                SodiumMm = na,
                RingStep = ckStep,
                RingVoltageMv = ckV,
                RingPreviousVoltageMv = ckVPrev,
                RingCalciumMm = ckCa,
                RingSodiumMm = ckNa,
                RingGates = ckX,
            }
            : null;
        var result = new SweepLane[lanes];
        for (int l = 0; l < lanes; l++) result[l] = new SweepLane(spikes[l], resume[l]);
        return result;
    }

    /// <summary>GHK driving term (mV) of calcium channels at V = vm and shell calcium (as Nernst.GhkDrivingMv computes it).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Vector256<double> Ghk(Vector256<double> vm, Vector256<double> caIn, Vector256<double> caOut, Vector256<double> vt2, Vector256<double> invVt2)
    {
        var ci = Vector256.Max(caIn, Vector256.Create(1e-9));
        var u = vm * invVt2;
        var one = Vector256.Create(1.0);
        var e = InlineExp.Exp(Vector256.Create(0.0) - u);
        var linear = Vector256.ConditionalSelect(Vector256.LessThan(Vector256.Abs(u), Vector256.Create(1e-6)),
            vt2 * Fma.MultiplyAdd(u, Vector256.Create(0.5), one), vm / (one - e));
        return linear * (ci / caOut - e);
    }

    /// <summary>Lane l of the newest ring snapshot taken at or before step 'latest' (null when none is that early).</summary>
    private static ResumePoint? Snapshot(int l, int latest, int[] ckStep, Vector256<double>[] ckX, Vector256<double>[] ckV, Vector256<double>[] ckVPrev,
        Vector256<double>[] ckCa, Vector256<double>[] ckNa, int gates, double dt)
    {
        int best = -1;
        for (int k = 0; k < ckStep.Length; k++)
            if (ckStep[k] >= 0 && ckStep[k] <= latest && (best < 0 || ckStep[k] > ckStep[best])) best = k;
        if (best < 0) return null;
        var gs = new double[gates];
        for (int g = 0; g < gates; g++) gs[g] = ckX[best * gates + g][l];
        return new ResumePoint(ckStep[best], ckStep[best] * dt, new CellState(ckV[best][l], gs, ckCa[best][l], ckNa[best][l]), ckVPrev[best][l]);
    }
}
