namespace ExprModel.Core.Cell;

/// <summary>What a measured value is an amount of. Values convert within a quantity; current and current density convert
/// into each other only with a cell's membrane area.</summary>
public enum Quantity
{
    Voltage,
    Current,
    CurrentDensity,
    Resistance,
    Time,
    Rate,
    RatePerCurrent,
    RatePerCurrentDensity,
    VoltageRate,
    Dimensionless,
}
