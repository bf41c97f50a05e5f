namespace ExprModel.Core.Expression.Metadata;

/// <summary>
/// A recorded (measured) numeric read-out per cell, kept for comparison with the model and for fitting.
/// </summary>
/// <param name="Header">The column header exactly as written.</param>
/// <param name="Name">The header without its unit ("resting potential (mV)" gives "resting potential").</param>
/// <param name="Unit">The unit as written in the header ("mV", "MOhm"), or null when the header names none.</param>
/// <param name="Values">One value per cell in <see cref="CellMetadata.CellIds"/> order; null where the cell has no recording.</param>
public sealed record RecordedColumn(string Header, string Name, string? Unit, double?[] Values);
