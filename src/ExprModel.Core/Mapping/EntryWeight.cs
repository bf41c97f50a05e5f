namespace ExprModel.Core.Mapping;

/// <summary>A gene of the table feeding one entry with a weight.</summary>
public sealed record EntryWeight(string EntryId, double Weight);
