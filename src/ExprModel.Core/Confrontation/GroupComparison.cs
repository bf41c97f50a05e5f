namespace ExprModel.Core.Confrontation;

/// <summary>One group's recorded mean and spread of one read-out against the mean prediction over the same cells.</summary>
/// <param name="RecordedCells">Cells of the group with a recorded value.</param>
/// <param name="RecordedSd">Sample standard deviation of the recorded values; null with fewer than 3 cells.</param>
/// <param name="PredictedCells">Of those, cells with a predicted value.</param>
/// <param name="Difference">Mean predicted minus mean recorded.</param>
/// <param name="ZScore">The difference over the recorded SD.</param>
public sealed record GroupComparison(string Group, string Readout, string Unit, int RecordedCells, double? RecordedMean, double? RecordedSd,
    int PredictedCells, double? PredictedMean, double? Difference, double? ZScore, string Note);
