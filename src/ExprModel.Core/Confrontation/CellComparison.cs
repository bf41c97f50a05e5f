namespace ExprModel.Core.Confrontation;

/// <summary>One cell's predicted and recorded value of one read-out, in the read-out's unit.</summary>
/// <param name="Model">The model the prediction came from (the cell itself, or its group).</param>
/// <param name="Difference">Predicted minus recorded.</param>
/// <param name="ZScore">The difference in units of the group's recorded spread (SD over its recorded cells); null with fewer than 3.</param>
/// <param name="Note">Why a value is missing, when one is.</param>
public sealed record CellComparison(string CellId, string? Group, string Model, string Readout, string Unit, double? Predicted, double? Recorded,
    double? Difference, double? ZScore, string Note)
{
    /// <summary>
    /// Where the recorded value came from ("sweeps FH1001.nwb", "table metadata.csv, column '...'"); empty when the one
    /// table gave every value.
    /// </summary>
    public string RecordedSource { get; init; } = "";
}
