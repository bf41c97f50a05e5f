using ExprModel.Core.Analysis;

namespace ExprModel.Core.Recordings;

/// <summary>The rates of one recorded step (the simulator's <see cref="FiPoint"/>, whose current is here in pA) and the sweep it came from.</summary>
public sealed record RecordedFiPoint(int SweepNumber, double CurrentPa, FiPoint Rates);
