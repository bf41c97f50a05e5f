using ExprModel.Core.Mapping;

namespace ExprModel.Core.Export;

/// <summary>Mean and sample standard deviation of one read-out over the cells where it is defined (<see cref="Defined"/> of <see cref="Of"/> cells).</summary>
public sealed record ReadoutSpread(double Mean, double StandardDeviation, int Defined, int Of)
{
    /// <summary>The spread of the finite values among <paramref name="values"/>; null when there is none.</summary>
    public static ReadoutSpread? Over(IEnumerable<double?> values)
    {
        var all = values.ToList();
        var defined = all.Where(x => x is { } d && double.IsFinite(d)).Select(x => x!.Value).ToArray();
        if (defined.Length == 0) return null;
        // The library's one group statistic (mean, sample SD), over the defined values as one group.
        var s = CellGroups.Statistic("", Enumerable.Range(0, defined.Length).ToArray(), defined);
        return new ReadoutSpread(s.Mean, s.StandardDeviation, defined.Length, all.Count);
    }
}
