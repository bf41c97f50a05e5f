using System.Runtime.Intrinsics.X86;

namespace ExprModel.Core.Tests.Simulation;

/// <summary>Whether this CPU runs the SIMD sweep kernel (AVX2 and FMA), for the skip reason of SIMD-only tests.</summary>
public static class SimdSupport
{
    public static string? Missing =>
        Avx2.IsSupported && Fma.IsSupported ? null : "this CPU lacks AVX2 or FMA, so the SIMD kernel never runs here (the scalar loop does)";
}
