using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

/// <summary>Why a channel gene is or is not linked: linked, auxiliary, non-neuronal, not-modelled.</summary>
public sealed record GeneStatus(Species Species, string Symbol, string Status, string Reason);
