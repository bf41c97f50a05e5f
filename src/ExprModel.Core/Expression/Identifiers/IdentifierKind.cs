namespace ExprModel.Core.Expression.Identifiers;

/// <summary>What kind of identifier a string is.</summary>
public enum IdentifierKind { EnsemblGene, Symbol, Other }
