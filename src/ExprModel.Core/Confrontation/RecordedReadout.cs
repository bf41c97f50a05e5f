using ExprModel.Core.Cell;

namespace ExprModel.Core.Confrontation;

/// <summary>One read-out's recorded values per cell, in the unit of its column, with the units to convert between.</summary>
/// <param name="Readout">The read-out's name (as in <c>CellReadouts.Rows()</c>).</param>
/// <param name="Header">The column the values came from.</param>
/// <param name="ValueByCell">Recorded value per cell id, in <paramref name="ColumnUnit"/>; cells without a value are absent.</param>
public sealed record RecordedReadout(string Readout, string Header, MeasurementUnit ColumnUnit, MeasurementUnit ReadoutUnit,
    IReadOnlyDictionary<string, double> ValueByCell)
{
    /// <summary>A recorded value in the read-out's unit; <paramref name="areaUm2"/> is the model cell's area for current versus
    /// current density.</summary>
    public double InReadoutUnit(double value, double? areaUm2) => MeasurementUnits.Convert(value, ColumnUnit, ReadoutUnit, areaUm2);

    /// <summary>Where each cell's value came from, when the values come from more than one place (sweeps and a table); null when
    /// every value is from <see cref="Header"/> of the one table.</summary>
    public IReadOnlyDictionary<string, string>? SourceByCell { get; init; }

    /// <summary>A note per cell on how its value was chosen (the table's value a sweep's value replaced).</summary>
    public IReadOnlyDictionary<string, string>? NoteByCell { get; init; }
}
