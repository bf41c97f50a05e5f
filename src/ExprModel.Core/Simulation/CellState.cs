namespace ExprModel.Core.Simulation;

/// <summary>The full state of a cell at one instant: membrane potential, every gate, shell calcium.</summary>
public sealed record CellState(double VoltageMv, double[] Gates, double CalciumMm);
