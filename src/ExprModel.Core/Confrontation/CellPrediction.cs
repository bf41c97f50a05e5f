using ExprModel.Core.Analysis;

namespace ExprModel.Core.Confrontation;

/// <summary>The read-outs predicted for one recorded cell, by the model built for it or for its group.</summary>
/// <param name="Model">What the model stands for: the cell id, or "group NAME".</param>
/// <param name="Readouts">Null when the model could not be built or measured (<paramref name="Warnings"/> says why).</param>
public sealed record CellPrediction(string Model, CellReadouts? Readouts, string Warnings);
