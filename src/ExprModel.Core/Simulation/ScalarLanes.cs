namespace ExprModel.Core.Simulation;

/// <summary>One lane: plain double arithmetic with the runtime's Math functions.</summary>
internal readonly struct ScalarLanes : ILaneMath<double>
{
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static double Broadcast(double value) => value;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static double Add(double a, double b) => a + b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static double Multiply(double a, double b) => a * b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static double Divide(double a, double b) => a / b;
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static double Max(double a, double b) => Math.Max(a, b);
    [MethodImpl(MethodImplOptions.AggressiveInlining)] public static double Power(double x, double y) => Math.Pow(x, y);
}
