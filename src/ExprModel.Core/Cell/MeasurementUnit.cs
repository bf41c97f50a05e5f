namespace ExprModel.Core.Cell;

/// <summary>A unit as a table header or a read-out states it: its quantity and the factor that takes a value to the
/// quantity's base unit (mV, pA, uA/cm2, MOhm, ms, Hz, Hz/nA, Hz per uA/cm2, mV/ms, 1).</summary>
public sealed record MeasurementUnit(string Symbol, Quantity Quantity, double ToBase);
