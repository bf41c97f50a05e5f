namespace ExprModel.Core.Mapping;

/// <summary>
/// A gene of the table feeding one entry with a weight. <paramref name="ProxyReason"/> is set when the link is a proxy
/// (the entry's kinetics belong to another family and stand in for the gene's own).
/// </summary>
public sealed record EntryWeight(string EntryId, double Weight, string? ProxyReason = null)
{
    public bool IsProxy => ProxyReason is not null;
}
