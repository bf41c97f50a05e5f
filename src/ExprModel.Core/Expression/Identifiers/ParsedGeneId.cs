namespace ExprModel.Core.Expression.Identifiers;

/// <summary>A parsed gene identifier.</summary>
/// <param name="Text">As written in the file.</param>
/// <param name="Kind">Ensembl gene id, symbol or other.</param>
/// <param name="Key">Comparison key: an Ensembl id without its version suffix; a symbol as written.</param>
/// <param name="Species">From the Ensembl prefix, or null when the identifier does not tell.</param>
/// <param name="EnsemblVersion">Version suffix of an Ensembl id (".5" gives 5), if any.</param>
public sealed record ParsedGeneId(string Text, IdentifierKind Kind, string Key, Species? Species, int? EnsemblVersion);
