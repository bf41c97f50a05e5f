namespace ExprModel.Core.Simulation;

/// <summary>A model that cannot be simulated, with the parameter at fault.</summary>
public sealed class ModelException(string message) : Exception(message);
