namespace ExprModel.Core.Mapping;

/// <summary>A gene of the table feeding an entry of another family's kinetics as a stand-in for its own, and why.</summary>
public sealed record ProxyLink(string Symbol, string EntryId, string Reason);
