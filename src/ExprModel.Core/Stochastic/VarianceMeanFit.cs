namespace ExprModel.Core.Stochastic;

/// <summary>
/// Noise analysis: for N independent channels of unitary current i and mean current I, the ensemble variance is
/// sigma^2 = i I - I^2 / N (binomial; common practice), a parabola through the origin whose initial slope is i and
/// whose second root is I = N i. Fitted by least squares on the two basis functions I and I^2.
/// </summary>
public sealed record VarianceMeanFit(double UnitaryCurrentPa, double ChannelCount, int Samples)
{
    /// <summary>The parabola's variance (pA^2) at mean current <paramref name="meanPa"/>.</summary>
    public double VarianceAt(double meanPa) => UnitaryCurrentPa * meanPa - meanPa * meanPa / ChannelCount;

    /// <summary>Fits the parabola to the samples; null when fewer than 3 samples or the fit is degenerate.</summary>
    public static VarianceMeanFit? Fit(ReadOnlySpan<double> meanPa, ReadOnlySpan<double> variancePa2)
    {
        double s11 = 0, s12 = 0, s22 = 0, b1 = 0, b2 = 0;
        int n = 0;
        for (int j = 0; j < meanPa.Length; j++)
        {
            double x = meanPa[j], y = variancePa2[j];
            if (!double.IsFinite(x) || !double.IsFinite(y)) continue;
            double x2 = x * x;
            s11 += x2;
            s12 += x2 * x;
            s22 += x2 * x2;
            b1 += x * y;
            b2 += x2 * y;
            n++;
        }
        double det = s11 * s22 - s12 * s12;
        if (n < 3 || !(Math.Abs(det) > 1e-12 * Math.Max(s11 * s22, 1e-300))) return null;
        double a = (b1 * s22 - b2 * s12) / det;
        double c = (s11 * b2 - s12 * b1) / det;
        if (c == 0) return null;
        return new VarianceMeanFit(a, -1 / c, n);
    }
}
