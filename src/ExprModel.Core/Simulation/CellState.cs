namespace ExprModel.Core.Simulation;

/// <summary>
/// The full state of a cell at one instant: membrane potential, every gate, shell calcium and shell sodium (mM; NaN =
/// at the shell's rest, the value for cells without a sodium shell).
/// </summary>
public sealed record CellState(double VoltageMv, double[] Gates, double CalciumMm, double SodiumMm = double.NaN);
