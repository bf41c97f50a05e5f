using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

/// <summary>
/// A gene feeding a catalog entry with a weight (one gene may feed several entries, e.g. a sodium gene feeding
/// the transient and a small persistent component). Role: "pore" for pore-forming subunits, others as documented.
/// </summary>
public sealed record GeneLink(Species Species, string Symbol, string EntryId, double Weight, string Role);

/// <summary>Why a channel gene is or is not linked: linked, auxiliary, non-neuronal, not-modelled.</summary>
public sealed record GeneStatus(Species Species, string Symbol, string Status, string Reason);

/// <summary>An identifier that names a gene: an alias, an Ensembl gene id or an Entrez id (from org.Hs.eg.db).</summary>
public sealed record GeneIdentifier(string Identifier, string Kind, string Symbol, Species Species);
