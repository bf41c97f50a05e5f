using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

/// <summary>An identifier that names a gene: an alias, an Ensembl gene id or an Entrez id (from org.Hs.eg.db).</summary>
public sealed record GeneIdentifier(string Identifier, string Kind, string Symbol, Species Species);
