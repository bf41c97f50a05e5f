using System.Runtime.Intrinsics;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Simulation;

/// <summary>
/// A calcium-bound rate (<see cref="RateShape.CalciumBoundOpening"/> or <see cref="RateShape.CalciumBoundClosing"/>,
/// Moczydlowski &amp; Latorre 1983, J Gen Physiol 82:511) in the form the SIMD kernel evaluates every step: the
/// constants broadcast, 1/K folded into a multiplier. Same formula as GateRate.Evaluate(v, ca).
/// </summary>
internal readonly record struct CalciumBoundRate(bool Opens, double MaxRatePerMs, double DissociationAtZeroMm, double MinusInverseKPerMv)
{
    public static CalciumBoundRate? From(GateRate rate) => rate.Shape switch
    {
        RateShape.CalciumBoundOpening => new CalciumBoundRate(true, rate.A, rate.C1, -1 / rate.K),
        RateShape.CalciumBoundClosing => new CalciumBoundRate(false, rate.A, rate.C1, -1 / rate.K),
        _ => null,
    };

    /// <summary>
    /// The rate (1/ms) at V (mV, shifted) and calcium (mM) in four lanes, from the constants broadcast once by the
    /// caller (<see cref="MaxRatePerMs"/>, <see cref="DissociationAtZeroMm"/>, <see cref="MinusInverseKPerMv"/>).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Vector256<double> Evaluate(bool opens, Vector256<double> maxRatePerMs, Vector256<double> dissociationAtZeroMm,
        Vector256<double> minusInverseKPerMv,
        Vector256<double> vMv, Vector256<double> calciumMm)
    {
        var e = InlineExp.Exp(vMv * minusInverseKPerMv);
        var one = Vector256.Create(1.0);
        return opens
            ? maxRatePerMs / (one + dissociationAtZeroMm * e / Vector256.Max(calciumMm, Vector256.Create(1e-12)))
            : maxRatePerMs / (one + Vector256.Max(calciumMm, Vector256.Create(0.0)) / (dissociationAtZeroMm * e));
    }
}
