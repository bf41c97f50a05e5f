using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The gate updates of one step of the SIMD sweep (<see cref="SweepKernel"/>), four lanes per vector, each kind of gate
/// in its own loop over the gates of that kind (<see cref="StepPlan.Update"/>). A gate's update reads only its own
/// state, V and the shells, so the order in which gates are advanced does not change any number; grouping them spares
/// the kernel a branch per gate and lets the table gates share their lane indices.
/// </summary>
internal static unsafe class SweepGates
{
    /// <summary>
    /// Where four lanes sit on the rate tables' grid: per lane the offset (in doubles) of its quad, and the fractions
    /// of the grid step arranged for <see cref="AdvanceTabulated"/> (lanes 0 and 2, lanes 1 and 3, each twice).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Locate(Vector256<double> vMv, Vector256<double> vMin, Vector256<double> invRes, Vector256<double> maxPos,
        out long i0, out long i1, out long i2, out long i3, out Vector256<double> f02, out Vector256<double> f13)
    {
        // Max and Min with the bound as second operand: the same result as the IEEE maximum/minimum for every number
        // (V is finite here: a step that leaves the physical range stops the sweep), in one instruction each.
        var pos = Avx.Min(Avx.Max((vMv - vMin) * invRes, Vector256<double>.Zero), maxPos);
        var fl = Avx.RoundToNegativeInfinity(pos);
        var f = pos - fl;
        var idx = Avx.ConvertToVector128Int32WithTruncation(fl);
        i0 = 4L * idx.GetElement(0);
        i1 = 4L * idx.GetElement(1);
        i2 = 4L * idx.GetElement(2);
        i3 = 4L * idx.GetElement(3);
        f02 = Avx.Permute(f, 0b0000);
        f13 = Avx.Permute(f, 0b1111);
    }

    /// <summary>
    /// Table gates: x &lt;- a x + b with a = decay + f d_decay and b = drive + f d_drive interpolated per lane from the
    /// gate's quad table (<see cref="RateTable.QuadPointers"/>). Lanes 0 and 2 share one vector, 1 and 3 another, so
    /// the interpolation runs before the lanes are gathered, with two shuffles per gate instead of eight.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void AdvanceTabulated(Vector256<double>* x, int* gates, int count, double** quads,
        long i0, long i1, long i2, long i3, Vector256<double> f02, Vector256<double> f13)
    {
        for (int k = 0; k < count; k++)
        {
            int g = gates[k];
            Interpolate(quads[g], i0, i1, i2, i3, f02, f13, out var a, out var b);
            x[g] = Fma.MultiplyAdd(a, x[g], b);
        }
    }

    /// <summary>Instantaneous gates: x = drive + f d_drive at V extrapolated to the half step (lane positions from <see cref="Locate"/>).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void SetInstantaneous(Vector256<double>* x, int* gates, int count, double** quads,
        long m0, long m1, long m2, long m3, Vector256<double> f02, Vector256<double> f13)
    {
        for (int k = 0; k < count; k++)
        {
            int g = gates[k];
            Interpolate(quads[g], m0, m1, m2, m3, f02, f13, out _, out var b);
            x[g] = b;
        }
    }

    /// <summary>
    /// Per lane a = decay_i + f d_decay_i and b = drive_i + f d_drive_i (one FMA each, as the scalar loop computes them):
    /// [decay, drive] of lanes 0 and 2 in one vector and their differences in another give [a0, b0, a2, b2] with one FMA,
    /// likewise lanes 1 and 3; two unpacks then put a and b in lane order.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void Interpolate(double* q, long i0, long i1, long i2, long i3, Vector256<double> f02, Vector256<double> f13,
        out Vector256<double> a, out Vector256<double> b)
    {
        var base02 = Vector256.Create(Sse2.LoadVector128(q + i0), Sse2.LoadVector128(q + i2));
        var diff02 = Vector256.Create(Sse2.LoadVector128(q + i0 + 2), Sse2.LoadVector128(q + i2 + 2));
        var base13 = Vector256.Create(Sse2.LoadVector128(q + i1), Sse2.LoadVector128(q + i3));
        var diff13 = Vector256.Create(Sse2.LoadVector128(q + i1 + 2), Sse2.LoadVector128(q + i3 + 2));
        var ab02 = Fma.MultiplyAdd(f02, diff02, base02);
        var ab13 = Fma.MultiplyAdd(f13, diff13, base13);
        a = Avx.UnpackLow(ab02, ab13);
        b = Avx.UnpackHigh(ab02, ab13);
    }

    /// <summary>
    /// Gates gated by shell concentration: Hill gates relax to their steady state at shell calcium (or sodium) with a
    /// constant time constant; calcium-bound rate (BK-type) gates take the exact update for rates at V (with the
    /// channel's shift) and shell calcium.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void AdvanceConcentrationGated(Vector256<double>* x, SweepCoefficients k, Vector256<double> v, Vector256<double> ca, Vector256<double> na)
    {
        foreach (int g in k.HillGates)
        {
            var hill = StepPlan.HillSteadyState<VectorLanes, Vector256<double>>(k.ReadsSodium[g] ? na : ca, k.HillWhole[g], k.HillMagnitude[g],
                k.HillHalfPower[g], k.HillRises[g]);
            x[g] = Fma.MultiplyAdd(x[g] - hill, k.ConcentrationDecay[g], hill);
        }
        foreach (int g in k.CalciumRateGates)
        {
            var vs = v - k.ShiftMv[g];
            var opening = CalciumBoundRate.Evaluate(k.OpenShape[g], k.OpenA[g], k.OpenC1[g], k.OpenK[g], vs, ca);
            var closing = CalciumBoundRate.Evaluate(k.CloseShape[g], k.CloseA[g], k.CloseC1[g], k.CloseK[g], vs, ca);
            var sum = opening + closing;
            var inf = opening / sum;
            x[g] = Fma.MultiplyAdd(x[g] - inf, InlineExp.Exp(sum * k.RateExponent[g]), inf);
        }
    }
}
