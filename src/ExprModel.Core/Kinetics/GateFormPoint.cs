namespace ExprModel.Core.Kinetics;

/// <summary>
/// Both forms of one gate at one voltage and temperature: opening and closing rates (1/ms) and steady state with time
/// constant (ms). One pair is the entry's own, the other converted (see <see cref="GateForms"/>).
/// </summary>
public sealed record GateFormPoint(double VoltageMv, double AlphaPerMs, double BetaPerMs, double SteadyState, double TimeConstantMs);
