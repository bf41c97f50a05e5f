namespace ExprModel.Core.Expression.Shrinkage;

/// <summary>
/// Empirical-Bayes estimates of per-cell expression rates from sparse counts: counts y_i ~ Poisson(s_i lambda_i) with
/// exposure s_i = library size / 1e6, rates lambda_i ~ Gamma(a, b) shared by a group of cells, and the prior's mean and
/// variance estimated from the group's own counts by the method of moments with unequal exposures of Marshall (1991,
/// "Mapping disease and mortality rates using empirical Bayes estimators", Applied Statistics 40:283-294, its global moment estimator;
/// recalled, not re-checked): m = sum y / sum s; s2 = sum s_i (y_i/s_i - m)^2 / sum s; variance A = s2 - m / mean(s),
/// set to 0 when negative. The same model is the Poisson-gamma example of empirical-Bayes estimation in Carlin and
/// Louis, "Bayesian Methods for Data Analysis" (3rd ed. 2009, ch. 5; from memory). Each cell's estimate is the
/// posterior mean (y_i + a) / (s_i + b) (<see cref="GammaPoissonPrior.PosteriorMeanCpm"/>), which moves a cell's raw
/// CPM towards the group mean the more, the smaller its library and the less the group's rates vary.
/// </summary>
public static class GammaPoissonShrinkage
{
    /// <summary>Estimates the prior of one gene over the cells <paramref name="members"/>.</summary>
    /// <param name="counts">The gene's raw counts, one per cell of the table.</param>
    /// <param name="libraryCounts">Every cell's library size (total counts).</param>
    public static GammaPoissonPrior EstimatePrior(IReadOnlyList<double> counts, IReadOnlyList<double> libraryCounts, IReadOnlyList<int> members)
    {
        double sumCounts = 0, sumExposure = 0;
        int n = 0;
        foreach (int i in members)
        {
            double s = libraryCounts[i] / 1e6;
            if (!(s > 0)) continue;
            sumCounts += counts[i];
            sumExposure += s;
            n++;
        }
        if (n == 0 || sumExposure <= 0) return new GammaPoissonPrior(0, 0, 0);
        double mean = sumCounts / sumExposure;
        double weightedSquares = 0;
        foreach (int i in members)
        {
            double s = libraryCounts[i] / 1e6;
            if (!(s > 0)) continue;
            double d = counts[i] / s - mean;
            weightedSquares += s * d * d;
        }
        double spread = weightedSquares / sumExposure;
        double variance = Math.Max(0, spread - mean / (sumExposure / n));
        return new GammaPoissonPrior(mean, variance, n);
    }
}
