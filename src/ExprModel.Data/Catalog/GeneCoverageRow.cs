using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Data.Catalog;

/// <summary>One gene of the catalog's gene tables: its status and the entries its expression feeds.</summary>
/// <param name="Entries">Linked entry ids, with the weight after a colon when it is not 1 (e.g. "nap-ca1-golomb2006:0.5").</param>
public sealed record GeneCoverageRow(string Symbol, Species Species, string Status, IReadOnlyList<string> Entries, string Reason);
