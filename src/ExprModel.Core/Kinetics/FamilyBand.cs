namespace ExprModel.Core.Kinetics;

/// <summary>A plausibility band for the half-activation (or half-inactivation) of a family's steady-state gate.</summary>
public sealed record FamilyBand(string Family, double ActivationLowMv, double ActivationHighMv, double? InactivationLowMv = null,
    double? InactivationHighMv = null);
