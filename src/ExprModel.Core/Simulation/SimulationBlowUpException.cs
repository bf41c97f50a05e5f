namespace ExprModel.Core.Simulation;

/// <summary>
/// A simulation whose state left the physical range: names the time, the protocol step, the state and the
/// channel carrying the largest current, so the user can see which parameter to fix.
/// </summary>
public sealed class SimulationBlowUpException(string message, double timeMs, string channel, CellState state) : Exception(message)
{
    public double TimeMs { get; } = timeMs;
    public string Channel { get; } = channel;
    public CellState State { get; } = state;
}
