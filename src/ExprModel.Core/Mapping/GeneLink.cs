using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Mapping;

/// <summary>
/// A gene feeding a catalog entry with a weight (one gene may feed several entries, e.g. a sodium gene feeding
/// the transient and a small persistent component). Role: "pore" when the entry has kinetics of the gene's own family;
/// "proxy" when the gene feeds another family's kinetics as a stand-in (<paramref name="Reason"/> says why). Proxies do
/// not count toward gene coverage and are shown as such wherever links are shown.
/// </summary>
public sealed record GeneLink(Species Species, string Symbol, string EntryId, double Weight, string Role, string Reason = "")
{
    /// <summary>The role of a stand-in link to another family's kinetics.</summary>
    public const string ProxyRole = "proxy";

    public bool IsProxy => Role == ProxyRole;
}
