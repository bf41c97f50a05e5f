using ExprModel.Core.Analysis;

namespace ExprModel.Core.Mapping;

/// <summary>The main read-outs of one group or cell of a batch.</summary>
public sealed record BatchRow(int Index, string Item, int Cells, CellReadouts? Readouts, IReadOnlyList<double> RatesAtStandardStepsHz, string Warnings);
