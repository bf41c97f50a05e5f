using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The sweep hot loop with four stimuli as SIMD lanes (AVX2 gathers from the rate tables, FMA, vector exp).
/// Same staggered scheme and the same spike rule as the scalar loop, so results agree with it to rounding.
/// Used for spike-only runs of cells whose channels are all ohmic and voltage-gated (no calcium shell);
/// everything else takes the scalar loop.
/// </summary>
internal static unsafe class SweepKernel
{
    public const int Width = 4;

    public static bool CanRun(CompiledCell cell) =>
        Avx2.IsSupported && Fma.IsSupported && !cell.HasShell
        && cell.Mode.All(m => m == DriveMode.Ohmic) && !cell.GateIsCalcium.Any(b => b);

    /// <summary>Runs up to four stimuli (each sampled per step) from the same initial state; returns spike times per lane.</summary>
    public static List<double>[] Run(CompiledCell cell, RateTable table, IReadOnlyList<double[]> stimuli, int steps, SimulationSettings settings, CellState init, CancellationToken cancel)
    {
        int lanes = stimuli.Count;
        if (lanes is < 1 or > Width) throw new ArgumentOutOfRangeException(nameof(stimuli));
        int gates = cell.GateCount, channels = cell.ChannelCount;
        double dt = settings.DtMs;
        var stim = new double[steps * Width];
        for (int s = 0; s < steps; s++)
            for (int l = 0; l < Width; l++) stim[s * Width + l] = l < lanes ? stimuli[l][s] : stimuli[0][s];
        var flat = table.Flat;
        int stride = 2 * table.Points;
        var x = new Vector256<double>[gates];
        for (int g = 0; g < gates; g++) x[g] = Vector256.Create(init.Gates[g]);
        var gbar = cell.Gbar.Select(Vector256.Create).ToArray();
        var erev = cell.Erev.Select(Vector256.Create).ToArray();
        var power = cell.GatePower;
        var instant = cell.GateIsInstantaneous;
        bool anyInstant = instant.Any(b => b);
        var gateStart = cell.GateStart;
        var gateEnd = cell.GateEnd;
        var v = Vector256.Create(init.VoltageMv);
        var vPrev = v;
        var vMin = Vector256.Create(RateTable.MinMv);
        var invRes = Vector256.Create(1.0 / RateTable.ResolutionMv);
        var zero = Vector256<double>.Zero;
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
        var pending = new double[Width];
        var lastCross = new double[Width];
        Array.Fill(pending, double.NaN);
        Array.Fill(lastCross, double.NegativeInfinity);
        bool anyPending = false;

        fixed (double* T = flat)
        fixed (double* S = stim)
        {
            for (int s = 0; s < steps; s++)
            {
                if ((s & 0xFFFF) == 0 && cancel.IsCancellationRequested) cancel.ThrowIfCancellationRequested();
                var pos = Vector256.Min(Vector256.Max((v - vMin) * invRes, zero), maxPos);
                var fl = Vector256.Floor(pos);
                var f = pos - fl;
                var idx = Avx.ConvertToVector128Int32WithTruncation(fl);
                idx = Sse2.ShiftLeftLogical(idx, 1);
                Vector128<int> idxMid = default;
                Vector256<double> fMid = default;
                if (anyInstant)
                {
                    var pm = Vector256.Min(Vector256.Max((Fma.MultiplyAdd(half, v - vPrev, v) - vMin) * invRes, zero), maxPos);
                    var flm = Vector256.Floor(pm);
                    fMid = pm - flm;
                    idxMid = Sse2.ShiftLeftLogical(Avx.ConvertToVector128Int32WithTruncation(flm), 1);
                }
                for (int g = 0; g < gates; g++)
                {
                    double* baseP = T + (long)g * stride;
                    if (instant[g])
                    {
                        var d0 = Avx2.GatherVector256(baseP + 1, idxMid, 8);
                        var d1 = Avx2.GatherVector256(baseP + 3, idxMid, 8);
                        x[g] = Fma.MultiplyAdd(fMid, d1 - d0, d0);
                        continue;
                    }
                    var a0 = Avx2.GatherVector256(baseP, idx, 8);
                    var a1 = Avx2.GatherVector256(baseP + 2, idx, 8);
                    var b0 = Avx2.GatherVector256(baseP + 1, idx, 8);
                    var b1 = Avx2.GatherVector256(baseP + 3, idx, 8);
                    var a = Fma.MultiplyAdd(f, a1 - a0, a0);
                    var b = Fma.MultiplyAdd(f, b1 - b0, b0);
                    x[g] = Fma.MultiplyAdd(a, x[g], b);
                }
                var gSum = zero;
                var gE = zero;
                for (int c = 0; c < channels; c++)
                {
                    var gc = gbar[c];
                    for (int k = gateStart[c]; k < gateEnd[c]; k++)
                    {
                        var xv = x[k];
                        var p = xv;
                        for (int q = 1; q < power[k]; q++) p *= xv;
                        gc *= p;
                    }
                    gSum += gc;
                    gE = Fma.MultiplyAdd(gc, erev[c], gE);
                }
                var current = Vector256.Load(S + (long)s * Width);
                vPrev = v;
                var drive = gE + current;
                var vInf = drive / Vector256.Max(gSum, tiny);
                var relaxed = Fma.MultiplyAdd(v - vInf, Vector256.Exp(gSum * minusDtOverC), vInf);
                var euler = Fma.MultiplyAdd(dtOverC, drive - gSum * v, v);
                v = Vector256.ConditionalSelect(Vector256.GreaterThan(gSum, tiny), relaxed, euler);

                if (!Vector256.LessThanAll(Vector256.Abs(v), limit))
                {
                    for (int l = 0; l < lanes; l++)
                        if (!(Math.Abs(v[l]) < 1000))
                            throw Simulator.BlowUp(cell, (s + 1) * dt, vPrev[l], x.Select(xx => xx[l]).ToArray(), cell.ShellRestMm, stim[s * Width + l]);
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
                            if (vl < levelMv) { spikes[l].Add(pending[l]); pending[l] = double.NaN; }
                            else if (t - pending[l] > maxWidth) pending[l] = double.NaN;
                        }
                        // Armed at an upward crossing iff the previous sample was below the level at least one
                        // refractory period after the last crossing (the scalar detector's rule, evaluated lazily).
                        if (vp < levelMv && vl >= levelMv && double.IsNaN(pending[l]) && (t - dt) - lastCross[l] >= refractory)
                        {
                            pending[l] = t - dt + (levelMv - vp) / (vl - vp) * dt;
                            lastCross[l] = pending[l];
                        }
                        if (!double.IsNaN(pending[l])) anyPending = true;
                    }
                }
            }
        }
        return spikes;
    }
}
