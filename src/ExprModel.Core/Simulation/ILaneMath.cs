namespace ExprModel.Core.Simulation;

/// <summary>
/// The arithmetic a step-plan formula needs, for one lane (<see cref="ScalarLanes"/>) or four SIMD lanes
/// (<see cref="VectorLanes"/>). A formula written once against it (<see cref="StepPlan.Conductance{TMath, T}"/>,
/// <see cref="StepPlan.HillSteadyState{TMath, T}"/>) is specialised and inlined by the JIT for each lane type, so the
/// scalar loop, the SIMD kernel and the ODE right-hand side compute it alike at no cost.
/// </summary>
internal interface ILaneMath<T> where T : struct
{
    static abstract T Broadcast(double value);
    static abstract T Add(T a, T b);
    static abstract T Multiply(T a, T b);
    static abstract T Divide(T a, T b);
    static abstract T Max(T a, T b);
    /// <summary>x^y for x &gt;= 0 (fractional Hill coefficients).</summary>
    static abstract T Power(T x, T y);
}
