namespace ExprModel.Core.Stochastic;

/// <summary>
/// The conductance (pS) of one open channel of an entry, where it comes from and how sure it is. <see cref="Key"/> is the
/// entry id for a value cited for that entry, or "family:CODE" for a labelled family default.
/// </summary>
public sealed record UnitaryConductance(string Key, double ConductancePs, bool IsFamilyDefault, string Citation, string Note)
{
    /// <summary>"entry" or "family default (CODE)", for tables and exports.</summary>
    public string BasisLabel => IsFamilyDefault ? $"family default ({Key["family:".Length..]})" : "entry";
}
