namespace ExprModel.Core.Expression.Identifiers;

/// <summary>A problem with a set of identifiers: duplicates, case collisions, the same Ensembl gene in two versions.</summary>
public sealed record IdentifierIssue(string Kind, IReadOnlyList<string> Identifiers, string Message);
