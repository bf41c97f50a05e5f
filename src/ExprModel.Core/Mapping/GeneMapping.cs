using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

/// <summary>A channel gene of the table linked to catalog entries, with its normalised expression per cell.</summary>
public sealed record GeneMapping(string TableId, string Symbol, Species Species, string How, IReadOnlyList<EntryWeight> Entries, double[] ExpressionByCell,
    bool Excluded, string? Note);
