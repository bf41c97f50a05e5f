using ExprModel.Core.Export;
using ExprModel.Core.Mapping;
using MathNet.Numerics.Statistics;

namespace ExprModel.Core.Tests.Export;

/// <summary>The per-cell batch of demo cells summarised by group, checked against MathNet.Numerics' mean and sample SD.</summary>
public class BatchGroupSummaryTests
{
    [Fact]
    public void Group_spreads_are_the_mean_and_sample_sd_of_the_defined_readouts()
    {
        var data = DemoCells.WithGroups();
        var groupByCell =
            data.Groups!.Members.SelectMany(m => m.Value.Select(i => (Cell: data.Table.CellIds[i], Group: m.Key))).ToDictionary(x => x.Cell, x => x.Group);
        // Every tenth cell: each group gets a few.
        var targets = data.CellTargets.Where((_, i) => i % 10 == 0).ToArray();
        var rows = BatchReadouts.Run(data.Table, data.Map(), data.Catalog, new DensityRule(), targets, data.Groups, 0, targets.Length);

        var summary = BatchGroupSummary.Create(rows, id => groupByCell[id]);
        Assert.Equal(summary.Select(s => s.Group).Order(StringComparer.Ordinal), summary.Select(s => s.Group));
        Assert.Equal(rows.Count, summary.Sum(s => s.Measured + s.Failed));
        foreach (var s in summary)
        {
            var ok = rows.Where(r => groupByCell[r.Item] == s.Group && r.Readouts is not null).Select(r => r.Readouts!).ToArray();
            Assert.Equal(ok.Length, s.Measured);
            Check(ok.Select(r => r.RestingPotentialMv), s.RestingPotentialMv);
            Check(ok.Select(r => r.RheobasePa), s.RheobasePa);
            Check(ok.Select(r => r.InputResistanceMOhm), s.InputResistanceMOhm);
            Assert.Equal(ok.Count(r => r.ExcitabilityClass == 1), s.ClassOne);
            Assert.Equal(ok.Count(r => r.ExcitabilityClass == 2), s.ClassTwo);
        }
    }

    private static void Check(IEnumerable<double?> values, ReadoutSpread? spread)
    {
        var all = values.ToArray();
        var defined = all.Where(v => v is { } d && double.IsFinite(d)).Select(v => v!.Value).ToArray();
        if (defined.Length == 0) { Assert.Null(spread); return; }
        Assert.NotNull(spread);
        Assert.Equal(defined.Length, spread.Defined);
        Assert.Equal(all.Length, spread.Of);
        Assert.Equal(defined.Mean(), spread.Mean, 1e-9 * Math.Max(1, Math.Abs(spread.Mean)));
        double sd = defined.Length > 1 ? defined.StandardDeviation() : 0;
        Assert.Equal(sd, spread.StandardDeviation, 1e-9 * Math.Max(1, sd));
    }

    [Fact]
    public void No_defined_value_gives_no_spread() => Assert.Null(ReadoutSpread.Over([null, double.NaN]));
}
