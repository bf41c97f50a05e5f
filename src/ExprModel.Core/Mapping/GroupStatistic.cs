namespace ExprModel.Core.Mapping;

/// <summary>Expression of one gene or entry in one group of cells.</summary>
public sealed record GroupStatistic(string Group, int Cells, double Mean, double StandardDeviation, double FractionExpressing);
