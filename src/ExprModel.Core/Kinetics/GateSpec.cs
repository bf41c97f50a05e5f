namespace ExprModel.Core.Kinetics;

/// <summary>
/// One gating variable raised to <see cref="Power"/>. Alpha/beta gates convert to steady state and time
/// constant by x_inf = alpha/(alpha+beta), tau = 1/(alpha+beta) (Hodgkin &amp; Huxley 1952).
/// </summary>
public sealed record GateSpec
{
    public required string Name { get; init; }
    public int Power { get; init; } = 1;
    public GateKind Kind { get; init; } = GateKind.AlphaBeta;
    public GateRate? Alpha { get; init; }
    public GateRate? Beta { get; init; }
    public GateRate? SteadyState { get; init; }
    public GateRate? TimeConstantMs { get; init; }
    public CalciumSensitivity? Calcium { get; init; }
    public SodiumSensitivity? Sodium { get; init; }

    /// <summary>The gate follows its steady state instantly (e.g. sodium activation in Wang &amp; Buzsaki 1996).</summary>
    public bool Instantaneous { get; init; }

    /// <summary>A published multiplier on both rates (e.g. phi = 5 in Wang &amp; Buzsaki 1996); tau is divided by it.</summary>
    public double RateFactor { get; init; } = 1;

    /// <summary>Steady-state open probability of this gate at V (mV), intracellular calcium and shell sodium (mM).</summary>
    public double SteadyStateAt(double vMv, double calciumMm = 5e-5, double sodiumMm = 10)
    {
        switch (Kind)
        {
            case GateKind.AlphaBeta:
                {
                    double a = Alpha!.Evaluate(vMv), b = Beta!.Evaluate(vMv);
                    return a / (a + b);
                }
            case GateKind.SteadyStateAndTau:
                return SteadyState!.Evaluate(vMv);
            case GateKind.Calcium when Calcium is null:
                {
                    // Voltage- and calcium-dependent alpha/beta (Moczydlowski & Latorre 1983): x_inf = alpha/(alpha+beta).
                    double a = Alpha!.Evaluate(vMv, calciumMm), b = Beta!.Evaluate(vMv, calciumMm);
                    return a / (a + b);
                }
            case GateKind.Calcium:
                {
                    return Calcium!.SteadyStateAt(calciumMm);
                }
            case GateKind.Sodium:
                return Sodium!.SteadyStateAt(sodiumMm);
            default:
                throw new InvalidOperationException($"Unknown gate kind {Kind}.");
        }
    }

    /// <summary>
    /// Time constant (ms) at V and intracellular calcium (mM) before temperature scaling, including the rate factor.
    /// Differs from <see cref="TimeConstantAt(double)"/> only for calcium gates written as alpha/beta rates (BK-type),
    /// whose time constant 1/(alpha+beta) depends on both; a simulator should call this one per step for them.
    /// </summary>
    public double TimeConstantAt(double vMv, double calciumMm)
    {
        if (Kind == GateKind.Calcium && Calcium is null)
            return 1 / ((Alpha!.Evaluate(vMv, calciumMm) + Beta!.Evaluate(vMv, calciumMm)) * RateFactor);
        return TimeConstantAt(vMv);
    }

    /// <summary>True when the steady state depends on intracellular calcium (computed per step, not tabulated by voltage).</summary>
    public bool DependsOnCalcium => Kind == GateKind.Calcium;

    /// <summary>True when the steady state depends on shell sodium (computed per step, not tabulated by voltage).</summary>
    public bool DependsOnSodium => Kind == GateKind.Sodium;

    /// <summary>
    /// Time constant (ms) at V before temperature scaling, including the rate factor. For calcium gates written as
    /// alpha/beta rates it is evaluated at resting calcium (<see cref="GateRate.RestingCalciumMm"/>).
    /// </summary>
    public double TimeConstantAt(double vMv)
    {
        switch (Kind)
        {
            case GateKind.AlphaBeta:
                return 1 / ((Alpha!.Evaluate(vMv) + Beta!.Evaluate(vMv)) * RateFactor);
            case GateKind.SteadyStateAndTau:
                return TimeConstantMs!.Evaluate(vMv) / RateFactor;
            case GateKind.Calcium when Calcium is null:
                return TimeConstantAt(vMv, GateRate.RestingCalciumMm);
            case GateKind.Calcium:
                return Calcium!.TimeConstantMs / RateFactor;
            case GateKind.Sodium:
                return Sodium!.TimeConstantMs / RateFactor;
            default:
                throw new InvalidOperationException($"Unknown gate kind {Kind}.");
        }
    }

    /// <summary>Returns a description of the first inconsistency, naming the parameter, or null.</summary>
    public string? Problem()
    {
        if (Power < 1 || Power > 8) return $"gate {Name}: power must be 1 to 8";
        if (!(RateFactor > 0) || double.IsInfinity(RateFactor)) return $"gate {Name}: rateFactor must be positive";
        switch (Kind)
        {
            case GateKind.AlphaBeta:
                if (Alpha is null || Beta is null) return $"gate {Name}: alpha and beta are both required";
                return Alpha.Problem() is { } pa ? $"gate {Name} alpha: {pa}" : Beta.Problem() is { } pb ? $"gate {Name} beta: {pb}" : null;
            case GateKind.SteadyStateAndTau:
                if (SteadyState is null || (TimeConstantMs is null && !Instantaneous)) return $"gate {Name}: steadyState and tauMs are required";
                return SteadyState.Problem() is { } ps ? $"gate {Name} steadyState: {ps}"
                    : TimeConstantMs?.Problem() is { } pt ? $"gate {Name} tauMs: {pt}"
                    : null;
            case GateKind.Calcium when Calcium is null && (Alpha is not null || Beta is not null):
                if (Alpha is null || Beta is null) return $"gate {Name}: a calcium gate written as rates needs both alpha and beta";
                return Alpha.Problem() is { } ca ? $"gate {Name} alpha: {ca}" : Beta.Problem() is { } cb ? $"gate {Name} beta: {cb}" : null;
            case GateKind.Calcium:
                if (Calcium is null) return $"gate {Name}: calcium sensitivity is required";
                if (!(Calcium.HalfActivationMm > 0) || double.IsInfinity(Calcium.HalfActivationMm))
                    return $"gate {Name}: calcium halfActivationMm must be positive";
                if (!double.IsFinite(Calcium.HillCoefficient) || Calcium.HillCoefficient == 0 || Math.Abs(Calcium.HillCoefficient) > 8)
                    return $"gate {Name}: calcium hill must be a non-zero number between -8 and 8 (negative: calcium-dependent inactivation)";
                if (Instantaneous ? Calcium.TimeConstantMs != 0 : !(Calcium.TimeConstantMs > 0) || double.IsInfinity(Calcium.TimeConstantMs))
                    return $"gate {Name}: calcium tauMs must be positive (or 0 with instantaneous: true)";
                return null;
            case GateKind.Sodium:
                if (Sodium is null) return $"gate {Name}: sodium sensitivity is required";
                if (!(Sodium.HalfActivationMm > 0) || double.IsInfinity(Sodium.HalfActivationMm))
                    return $"gate {Name}: sodium halfActivationMm must be positive";
                if (!double.IsFinite(Sodium.HillCoefficient) || Sodium.HillCoefficient == 0 || Math.Abs(Sodium.HillCoefficient) > 8)
                    return $"gate {Name}: sodium hill must be a non-zero number between -8 and 8";
                if (Instantaneous ? Sodium.TimeConstantMs != 0 : !(Sodium.TimeConstantMs > 0) || double.IsInfinity(Sodium.TimeConstantMs))
                    return $"gate {Name}: sodium tauMs must be positive (or 0 with instantaneous: true)";
                return null;
        }
        return null;
    }
}
