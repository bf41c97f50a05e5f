namespace ExprModel.Core.Perturbation;

/// <summary>
/// One channel of a fit: its relative density before (as the model had it; 1 = as derived from expression) and after,
/// the fold change from the expression-derived density (= fitted relative density), the bounds searched, whether it was
/// held fixed, and whether the targets pin it down (<see cref="IdentifiabilityReport"/>).
/// </summary>
public sealed record FitChannel(string Channel, double StartRelative, double FittedRelative, double LowerRelative, double UpperRelative, bool Fixed,
    bool Pinned, double DataSdLn)
{
    public double FoldChange => FittedRelative;
    /// <summary>True when the fit ended within 1 % (in ln) of a bound: the data push past the plausible range.</summary>
    public bool AtBound => !Fixed && (Math.Abs(Math.Log(FittedRelative / LowerRelative)) < 0.01 || Math.Abs(Math.Log(UpperRelative / FittedRelative)) < 0.01);
}
