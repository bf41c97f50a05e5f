namespace ExprModel.Core.Analysis;

/// <summary>
/// A pulse-threshold bracket: pulses of <see cref="WidthMs"/> at <see cref="BelowUaPerCm2"/> evoke no spike, at
/// <see cref="ThresholdUaPerCm2"/> one does; the threshold is the upper end.
/// </summary>
public sealed record PulseThresholdResult(double WidthMs, double BelowUaPerCm2, double ThresholdUaPerCm2)
{
    /// <summary>The charge the threshold pulse delivers (nC/cm2 = uA/cm2 x ms).</summary>
    public double ChargeNcPerCm2 => ThresholdUaPerCm2 * WidthMs;
}
