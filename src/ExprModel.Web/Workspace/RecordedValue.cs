namespace ExprModel.Web.Workspace;

/// <summary>
/// A recorded value of one read-out for a model's target, in the read-out's unit (as <c>CellReadouts.Rows()</c> names it):
/// a cell's own value, or a group's mean over its recorded cells with their sample SD.
/// </summary>
/// <param name="Value">The cell's value, or the group's mean.</param>
/// <param name="Sd">The group's sample SD (null for a cell, and for fewer than 3 recorded cells, as the z-scores use it).</param>
/// <param name="Cells">Recorded cells behind the value (1 for a cell).</param>
/// <param name="Source">Where it came from: the features table's column, or "sweeps" (read-outs measured from the recorded sweeps).</param>
public sealed record RecordedValue(string Readout, string Unit, double Value, double? Sd, int Cells, string Source);
