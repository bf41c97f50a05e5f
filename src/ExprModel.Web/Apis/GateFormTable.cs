using ExprModel.Core.Kinetics;

namespace ExprModel.Web.Apis;

/// <summary>
/// One gate in both forms at a few voltages: <see cref="WrittenAs"/> says which pair is the entry's own ("rates" or
/// "steady-state"), <see cref="Conversion"/> the formula that gives the other, and the count of its parameters.
/// </summary>
public sealed record GateFormTable(string Gate, int Power, string WrittenAs, string Conversion, int ParameterCount, IReadOnlyList<GateFormPoint> Points);
