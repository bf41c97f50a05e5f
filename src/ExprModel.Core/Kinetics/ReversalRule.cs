namespace ExprModel.Core.Kinetics;

/// <summary>How a channel's driving force is computed.</summary>
public enum ReversalRule
{
    /// <summary>Nernst potential of the entry's ion from the model's concentrations.</summary>
    Nernst,
    /// <summary>A fixed reversal potential given by the entry (or overridden by the model).</summary>
    Fixed,
    /// <summary>Goldman-Hodgkin-Katz flux (calcium), scaled so gbar matches an ohmic channel far below reversal.</summary>
    GoldmanHodgkinKatz,
}
