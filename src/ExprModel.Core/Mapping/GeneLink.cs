using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

/// <summary>
/// A gene feeding a catalog entry with a weight (one gene may feed several entries, e.g. a sodium gene feeding
/// the transient and a small persistent component). Role: "pore" for pore-forming subunits, others as documented.
/// </summary>
public sealed record GeneLink(Species Species, string Symbol, string EntryId, double Weight, string Role);
