using System.Runtime.Intrinsics;
using System.Runtime.Intrinsics.X86;

namespace ExprModel.Core.Simulation;

/// <summary>
/// Natural logarithm of four positive normal doubles, straight-line code for the sweep kernel (see <see cref="InlineExp"/>
/// for why). x = 2^k m with m in [sqrt(1/2), sqrt(2)); log m = 2 atanh s, s = (m - 1)/(m + 1), |s| &lt;= 0.172, by its
/// series to s^21 (truncation below 1e-18 relative); k ln2 added with ln2 split in two parts. Within about 2 ulp of
/// Math.Log (test: InlineExpTests).
/// </summary>
internal static class InlineLog
{
    private const long SqrtHalfBits = 0x3FE6A09E667F3BCD;        // bits of sqrt(1/2)
    private const long Bias = 1024L << 52;                         // keeps the shifted exponent non-negative
    private const long TwoTo52Bits = 0x4330000000000000;          // bits of 2^52
    private const double Ln2Hi = 0.693147180369123816490;
    private const double Ln2Lo = 1.90821492927058770002e-10;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> Log(Vector256<double> x)
    {
        var bits = x.AsInt64();
        var shiftedExponent = Avx2.ShiftRightLogical(Avx2.Add(Avx2.Subtract(bits, Vector256.Create(SqrtHalfBits)), Vector256.Create(Bias)), 52); // k + 1024
        var mantissaBits = Avx2.Add(Avx2.Subtract(bits, Avx2.ShiftLeftLogical(shiftedExponent, 52)), Vector256.Create(Bias));
        var m = mantissaBits.AsDouble();
        var k = Avx.Subtract(Avx2.Or(shiftedExponent, Vector256.Create(TwoTo52Bits)).AsDouble(), Vector256.Create(4503599627370496.0 + 1024.0));
        var one = Vector256.Create(1.0);
        var s = Avx.Divide(Avx.Subtract(m, one), Avx.Add(m, one));
        var z = Avx.Multiply(s, s);
        // q(z) = 1/3 + z/5 + ... + z^9/21, so that log m = 2s + 2s z q(z).
        var p = Vector256.Create(1.0 / 21);
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 19));
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 17));
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 15));
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 13));
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 11));
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 9));
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 7));
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 5));
        p = Fma.MultiplyAdd(p, z, Vector256.Create(1.0 / 3));
        var twoS = Avx.Add(s, s);
        var logM = Fma.MultiplyAdd(Avx.Multiply(twoS, z), p, twoS);
        return Fma.MultiplyAdd(k, Vector256.Create(Ln2Hi), Fma.MultiplyAdd(k, Vector256.Create(Ln2Lo), logM));
    }
}
