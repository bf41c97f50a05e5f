namespace ExprModel.Core.Confrontation;

/// <summary>How one column of a recorded table was matched to a read-out, or why it was not.</summary>
/// <param name="ColumnNumber">1-based column number in the file.</param>
/// <param name="Readout">The read-out's name (as in <c>CellReadouts.Rows()</c>), or null when the column is not compared.</param>
/// <param name="ColumnUnit">The unit the header states, as written (null when it states none).</param>
/// <param name="ReadoutUnit">The read-out's unit, which recorded values are converted to.</param>
/// <param name="ByUser">The user chose this match (or chose to leave the column out).</param>
/// <param name="Reason">Why: the rule that matched, or what kept the column out.</param>
public sealed record ReadoutMatch(int ColumnNumber, string Header, string? Readout, string? ColumnUnit, string? ReadoutUnit, bool ByUser, string Reason)
{
    public bool Matched => Readout is not null;
}
