namespace ExprModel.Core.Stochastic;

/// <summary>One pulse amplitude of a firing-probability curve: the fraction of trials with at least one spike.</summary>
public sealed record FiringProbabilityPoint(double AmplitudeUaPerCm2, int Fired, int Trials)
{
    public double Probability => Trials == 0 ? double.NaN : (double)Fired / Trials;
}
