namespace ExprModel.Core.Mapping;

/// <summary>A channel gene present in the table that maps to no entry, with the catalog's reason.</summary>
public sealed record UnmappedChannelGene(string TableId, string Symbol, string Status, string Reason);
