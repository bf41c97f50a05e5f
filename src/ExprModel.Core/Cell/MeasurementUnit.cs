namespace ExprModel.Core.Cell;

/// <summary>What a measured value is an amount of. Values convert within a quantity; current and current density convert
/// into each other only with a cell's membrane area.</summary>
public enum Quantity { Voltage, Current, CurrentDensity, Resistance, Time, Rate, RatePerCurrent, RatePerCurrentDensity, VoltageRate, Dimensionless }

/// <summary>A unit as a table header or a read-out states it: its quantity and the factor that takes a value to the
/// quantity's base unit (mV, pA, uA/cm2, MOhm, ms, Hz, Hz/nA, Hz per uA/cm2, mV/ms, 1).</summary>
public sealed record MeasurementUnit(string Symbol, Quantity Quantity, double ToBase);
