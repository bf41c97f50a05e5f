using System.Runtime.Intrinsics;

namespace ExprModel.Core.Simulation;

/// <summary>Four lanes in one AVX2 register, with the inlined <see cref="InlineExp"/> and <see cref="InlineLog"/>.</summary>
internal readonly struct VectorLanes : ILaneMath<Vector256<double>>
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<double> Broadcast(double value) => Vector256.Create(value);
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<double> Add(Vector256<double> a, Vector256<double> b) => a + b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<double> Multiply(Vector256<double> a, Vector256<double> b) => a * b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<double> Divide(Vector256<double> a, Vector256<double> b) => a / b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static Vector256<double> Max(Vector256<double> a, Vector256<double> b) => Vector256.Max(a, b);

    /// <summary>exp(y log x), with x floored at 1e-300 so the logarithm stays finite (x^y is then below any calcium that matters).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> Power(Vector256<double> x, Vector256<double> y) =>
        InlineExp.Exp(y * InlineLog.Log(Vector256.Max(x, Vector256.Create(1e-300))));
}
