namespace ExprModel.Core.Mapping;

public sealed record GeneContribution(string Gene, double Weight, double Expression);
