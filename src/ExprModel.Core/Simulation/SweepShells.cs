using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The calcium and sodium shells of the SIMD sweep (<see cref="SweepKernel"/>), four lanes per vector, in the scalar
/// loop's order: after V's update, each shell takes the exact update toward the level its ion's current (at the
/// step's mid-point V, with the conductances of the step) holds it at, floored at zero.
/// </summary>
internal static class SweepShells
{
    /// <summary>Shell calcium after a step: current of the calcium-carrying channels (Ohmic, Nernst or GHK drive) at V = <paramref name="vMid"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> Calcium(Vector256<double> ca, Vector256<double> vMid, Vector256<double>[] gc, int[] carriers, DriveMode[] mode,
        Vector256<double>[] erev, Vector256<double> eCa, bool anyGhk, Vector256<double> caOut, Vector256<double> vt2, Vector256<double> invVt2,
        Vector256<double> rest, Vector256<double> gain, Vector256<double> decay)
    {
        var ica = Vector256<double>.Zero;
        var ghkMid = anyGhk ? GhkDrivingMv(vMid, ca, caOut, vt2, invVt2) : Vector256<double>.Zero;
        foreach (int c in carriers)
            ica = Fma.MultiplyAdd(gc[c], mode[c] switch { DriveMode.Ohmic => vMid - erev[c], DriveMode.NernstCalcium => vMid - eCa, _ => ghkMid }, ica);
        var caInf = rest - gain * ica;
        return Vector256.Max(Fma.MultiplyAdd(ca - caInf, decay, caInf), Vector256<double>.Zero);
    }

    /// <summary>Shell sodium after a step: current of the sodium-carrying channels at V = <paramref name="vMid"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> Sodium(Vector256<double> na, Vector256<double> vMid, Vector256<double>[] gc, int[] carriers,
        Vector256<double>[] erev, Vector256<double> rest, Vector256<double> gain, Vector256<double> decay)
    {
        var ina = Vector256<double>.Zero;
        foreach (int c in carriers) ina = Fma.MultiplyAdd(gc[c], vMid - erev[c], ina);
        var naInf = rest - gain * ina;
        return Vector256.Max(Fma.MultiplyAdd(na - naInf, decay, naInf), Vector256<double>.Zero);
    }

    /// <summary>GHK driving term (mV) of calcium channels at V = vm and shell calcium (as Nernst.GhkDrivingMv computes it).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> GhkDrivingMv(Vector256<double> vm, Vector256<double> caIn, Vector256<double> caOut, Vector256<double> vt2,
        Vector256<double> invVt2)
    {
        var ci = Vector256.Max(caIn, Vector256.Create(1e-9));
        var u = vm * invVt2;
        var one = Vector256.Create(1.0);
        var e = InlineExp.Exp(Vector256.Create(0.0) - u);
        var linear = Vector256.ConditionalSelect(Vector256.LessThan(Vector256.Abs(u), Vector256.Create(1e-6)),
            vt2 * Fma.MultiplyAdd(u, Vector256.Create(0.5), one), vm / (one - e));
        return linear * (ci / caOut - e);
    }
}
