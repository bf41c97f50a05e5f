namespace ExprModel.Core.Perturbation;

/// <summary>One target: the recorded value, the model's value before and after the fit (null: undefined), and the scale.</summary>
public sealed record FitResidual(string Readout, string Unit, double Recorded, double Scale, double? Before, double? After)
{
    public double? ScaledBefore => Before is { } b ? (b - Recorded) / Scale : null;
    public double? ScaledAfter => After is { } a ? (a - Recorded) / Scale : null;
}
