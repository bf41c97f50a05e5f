namespace ExprModel.Core.Analysis;

/// <summary>
/// The effective threshold, probed with a brief current pulse: the smallest pulse (uA/cm2) that evokes a spike from rest,
/// and the same at a fixed delay after a conditioning spike (or after the end of the train). A ratio above 1 means the cell
/// became harder to excite. <see cref="MembraneBeforeMv"/> is the membrane potential at the test pulse's onset after
/// conditioning: an after-hyperpolarisation alone also raises the pulse threshold, so a rise with the membrane back near
/// rest points at a changed threshold, not a lower start. Null values: no spike up to the search limit (128 uA/cm2).
/// </summary>
public sealed record ThresholdProbe(
    string Condition,
    double PulseMs,
    double DelayMs,
    double? AtRestUaPerCm2,
    double? AfterUaPerCm2,
    double RestMv,
    double? MembraneBeforeMv)
{
    /// <summary>Pulse threshold after conditioning / at rest.</summary>
    public double? CurrentRatio => AtRestUaPerCm2 is > 0 && AfterUaPerCm2 is { } a ? a / AtRestUaPerCm2 : null;
}
