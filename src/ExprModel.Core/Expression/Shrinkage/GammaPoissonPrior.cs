namespace ExprModel.Core.Expression.Shrinkage;

/// <summary>
/// The gamma prior of one gene's expression rate (CPM) over a set of cells, estimated from their counts: mean
/// <see cref="MeanCpm"/> and between-cell variance <see cref="RateVariance"/> of the true rates (counting noise removed).
/// Shape a = mean^2 / variance and rate b = mean / variance (per million counts of exposure). A variance of zero means the
/// counts vary no more than counting noise would: every cell then gets the mean.
/// </summary>
/// <param name="Cells">How many cells the prior was estimated from.</param>
public sealed record GammaPoissonPrior(double MeanCpm, double RateVariance, int Cells)
{
    /// <summary>Gamma shape a (infinite when the rates do not vary between cells).</summary>
    public double Shape => RateVariance > 0 ? MeanCpm * MeanCpm / RateVariance : double.PositiveInfinity;

    /// <summary>Gamma rate b in millions of counts (infinite when the rates do not vary between cells).</summary>
    public double RatePerMillion => RateVariance > 0 ? MeanCpm / RateVariance : double.PositiveInfinity;

    /// <summary>
    /// Posterior mean rate (CPM) of a cell with <paramref name="count"/> counts of the gene out of a library of
    /// <paramref name="libraryCounts"/>: (count + a) / (library / 1e6 + b), the conjugate gamma-Poisson update. Written as
    /// mean + w (count / exposure - mean) with w = variance / (variance + mean / exposure), which is the same number and
    /// stays finite when the variance is zero (w = 0) or the library is empty (w = 0: the prior mean).
    /// </summary>
    public double PosteriorMeanCpm(double count, double libraryCounts)
    {
        double exposure = libraryCounts / 1e6;
        if (!(exposure > 0) || !(RateVariance > 0)) return MeanCpm;
        double weight = RateVariance / (RateVariance + MeanCpm / exposure);
        return MeanCpm + weight * (count / exposure - MeanCpm);
    }
}
