namespace ExprModel.Core.Analysis;

/// <summary>Shape of one action potential measured on a recorded trace.</summary>
public sealed record SpikeShape(
    double ThresholdMv,
    double PeakMv,
    double AmplitudeMv,
    double HalfWidthMs,
    double AfterHyperpolarisationMv,
    double TroughMv,
    double MaxRiseMvPerMs);
