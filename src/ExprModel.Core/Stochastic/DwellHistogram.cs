namespace ExprModel.Core.Stochastic;

/// <summary>
/// Dwell times binned as a probability density (count / (n x bin width)) on equal bins from 0 to the 99th percentile,
/// with the theoretical density at each bin centre beside it, so the two can be drawn on one axis.
/// </summary>
public sealed record DwellHistogram(double[] BinCentresMs, double BinWidthMs, double[] Density, double[] Theory, int Count)
{
    public static DwellHistogram From(IReadOnlyList<double> dwellsMs, Func<double, double> theory, int bins = 40)
    {
        if (dwellsMs.Count == 0 || bins < 1) return new DwellHistogram([], 0, [], [], 0);
        var sorted = dwellsMs.Order().ToArray();
        double top = sorted[Math.Min(sorted.Length - 1, (int)(0.99 * sorted.Length))];
        if (!(top > 0)) top = sorted[^1] > 0 ? sorted[^1] : 1;
        double width = top / bins;
        var counts = new double[bins];
        foreach (var d in sorted)
        {
            int b = (int)(d / width);
            if (b < bins) counts[b]++;
        }
        var centres = new double[bins];
        var theoryValues = new double[bins];
        for (int b = 0; b < bins; b++)
        {
            centres[b] = (b + 0.5) * width;
            counts[b] /= sorted.Length * width;
            theoryValues[b] = theory(centres[b]);
        }
        return new DwellHistogram(centres, width, counts, theoryValues, sorted.Length);
    }
}
