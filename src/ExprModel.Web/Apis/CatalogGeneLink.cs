namespace ExprModel.Web.Apis;

/// <summary>A gene feeding a catalog entry: its symbol, whether it is a proxy (another family's kinetics standing in), and why.</summary>
public sealed record CatalogGeneLink(string Symbol, bool Proxy, string Reason);
