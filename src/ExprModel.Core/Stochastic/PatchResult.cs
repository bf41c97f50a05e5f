namespace ExprModel.Core.Stochastic;

/// <summary>
/// What a patch simulation gives: sample times, a few single-sweep current records, the ensemble mean, variance and
/// standard error over all sweeps beside the deterministic current, the dwell times inside the step, open
/// probabilities and the noise analysis. Currents in pA (outward positive).
/// </summary>
public sealed record PatchResult
{
    public required PatchSettings Settings { get; init; }
    public required double ReversalMv { get; init; }
    public required double[] TimesMs { get; init; }
    public required double[] CommandMv { get; init; }
    public required IReadOnlyList<double[]> SweepCurrentsPa { get; init; }
    public required double[] MeanCurrentPa { get; init; }
    public required double[] VarianceCurrentPa2 { get; init; }
    /// <summary>Standard error of the ensemble mean at each sample: sqrt(variance / sweeps).</summary>
    public required double[] StandardErrorPa { get; init; }
    /// <summary>N i P_open(t) from the gates' exact relaxation under the clamp (the Hodgkin-Huxley current of the patch).</summary>
    public required double[] DeterministicCurrentPa { get; init; }
    /// <summary>Unitary current at the step potential: gamma (V_step - E_rev), times any instantaneous gates' factor.</summary>
    public required double UnitaryCurrentAtStepPa { get; init; }
    public required IReadOnlyList<double> OpenDwellsMs { get; init; }
    public required IReadOnlyList<double> ClosedDwellsMs { get; init; }
    /// <summary>Fraction of channel time spent open during the last half of the step, over all sweeps.</summary>
    public required double MeasuredOpenProbability { get; init; }
    /// <summary>Stationary open probability at the step: product of steady-state gates to their powers.</summary>
    public required double StationaryOpenProbability { get; init; }
    /// <summary>Theoretical dwell-time densities of the chain at the step potential.</summary>
    public required DwellTimeTheory DwellTheory { get; init; }
    /// <summary>Variance-against-mean parabola fitted to the step's samples; null when the step gives too little spread.</summary>
    public required VarianceMeanFit? NoiseFit { get; init; }
    public required int StepStartSample { get; init; }
    public required int StepEndSample { get; init; }
}
