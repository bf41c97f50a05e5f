using System.Runtime.Intrinsics;

namespace ExprModel.Core.Simulation;

/// <summary>
/// Where a SIMD sweep can start instead of step 0: the four-lane state after a stretch every lane of a sweep shares (the
/// baseline at zero current before the steps come on), with the resume-point ring as it stood then. All lanes hold the
/// same values, so a sweep started here computes, lane by lane, exactly what it computes from the beginning.
/// </summary>
internal sealed class SweepStart
{
    public required int Step { get; init; }
    public required Vector256<double>[] Gates { get; init; }
    public required Vector256<double> VoltageMv { get; init; }
    public required Vector256<double> PreviousVoltageMv { get; init; }
    public required Vector256<double> CalciumMm { get; init; }
    public required Vector256<double> SodiumMm { get; init; }
    /// <summary>The resume-point ring (<see cref="SweepKernel"/>): per slot its step (-1 empty), V, previous V, calcium, sodium and gates.</summary>
    public required int[] RingStep { get; init; }
    public required Vector256<double>[] RingVoltageMv { get; init; }
    public required Vector256<double>[] RingPreviousVoltageMv { get; init; }
    public required Vector256<double>[] RingCalciumMm { get; init; }
    public required Vector256<double>[] RingSodiumMm { get; init; }
    public required Vector256<double>[] RingGates { get; init; }
}
