namespace ExprModel.Core.Simulation;

/// <summary>How a gate is advanced by one step in the fast loops (scalar and SIMD alike).</summary>
internal enum GateUpdate : byte
{
    /// <summary>Exact exponential update with decay and drive interpolated from the voltage rate table.</summary>
    Table,
    /// <summary>Set to the tabulated steady state at the V extrapolated to the coming half step.</summary>
    TableInstantaneous,
    /// <summary>Hill steady state of shell calcium (SK-type, or calcium-dependent inactivation) with a constant time constant.</summary>
    CalciumHill,
    /// <summary>Calcium-bound opening and closing rates (BK-type) evaluated every step from V and calcium.</summary>
    CalciumRates,
    /// <summary>Hill steady state of shell sodium (KNa-type) with a constant time constant; the Hill constants are the calcium Hill gate's.</summary>
    SodiumHill,
}
