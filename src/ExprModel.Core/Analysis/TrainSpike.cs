namespace ExprModel.Core.Analysis;

/// <summary>
/// One spike of a train with what follows it: its voltage threshold (dV/dt criterion), the trough before the next spike,
/// the after-hyperpolarisation depth (threshold minus trough), the interval to the next spike and each channel's mean current
/// density over the inter-spike ramp (from the trough to the next spike's threshold; outward positive). The last spike of
/// a train has no interval and no ramp.
/// </summary>
public sealed record TrainSpike(
    int Index,
    double TimeMs,
    double ThresholdMv,
    double TroughMv,
    double AfterHyperpolarisationMv,
    double? IntervalMs,
    IReadOnlyList<double>? RampCurrentsUaPerCm2);
