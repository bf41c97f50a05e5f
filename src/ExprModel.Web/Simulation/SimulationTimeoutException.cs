namespace ExprModel.Web.Simulation;

/// <summary>A simulation request that ran past the per-request time cap and was cancelled.</summary>
public sealed class SimulationTimeoutException(string message) : Exception(message);
