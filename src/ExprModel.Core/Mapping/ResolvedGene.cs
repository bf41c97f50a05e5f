using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

/// <summary>How a table identifier was matched to an official gene symbol.</summary>
public sealed record ResolvedGene(string TableId, string Symbol, Species Species, string How);
