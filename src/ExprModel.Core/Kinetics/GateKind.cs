namespace ExprModel.Core.Kinetics;

/// <summary>How a gate's kinetics are written in its source paper.</summary>
public enum GateKind
{
    /// <summary>dx/dt = alpha(V)(1 - x) - beta(V) x.</summary>
    AlphaBeta,
    /// <summary>dx/dt = (x_inf(V) - x) / tau(V).</summary>
    SteadyStateAndTau,
    /// <summary>
    /// Calcium-gated, computed per step from V and calcium: either x_inf = ca^n / (ca^n + Kd^n) with constant tau
    /// (SK-type, <see cref="GateSpec.Calcium"/>), or alpha/beta rates that depend on voltage and calcium
    /// (BK-type, <see cref="RateShape.CalciumBoundOpening"/> and <see cref="RateShape.CalciumBoundClosing"/>).
    /// </summary>
    Calcium,
    /// <summary>Sodium-gated: x_inf = na^n / (na^n + K^n) of the sodium shell with constant tau (<see cref="GateSpec.Sodium"/>).</summary>
    Sodium,
}
