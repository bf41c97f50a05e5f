using ExprModel.Core.Mapping;

namespace ExprModel.Core.Export;

/// <summary>
/// Per-cell batch read-outs summarised by group: how many cells were measured and failed, the spread of rheobase,
/// resting potential and input resistance, and how many cells fall in each excitability class.
/// </summary>
public sealed record BatchGroupSummary(string Group, int Measured, int Failed, ReadoutSpread? RheobasePa, ReadoutSpread? RestingPotentialMv,
    ReadoutSpread? InputResistanceMOhm, int ClassOne, int ClassTwo)
{
    /// <summary>One summary per group, groups in ordinal order.</summary>
    /// <param name="groupOf">The group of a row's item (a cell id).</param>
    public static IReadOnlyList<BatchGroupSummary> Create(IEnumerable<BatchRow> rows, Func<string, string> groupOf) =>
        rows.GroupBy(r => groupOf(r.Item)).OrderBy(g => g.Key, StringComparer.Ordinal).Select(g =>
        {
            var members = g.ToList();
            var ok = members.Where(r => r.Readouts is not null).Select(r => r.Readouts!).ToList();
            return new BatchGroupSummary(g.Key, ok.Count, members.Count - ok.Count,
                ReadoutSpread.Over(ok.Select(r => r.RheobasePa)), ReadoutSpread.Over(ok.Select(r => r.RestingPotentialMv)),
                ReadoutSpread.Over(ok.Select(r => r.InputResistanceMOhm)), ok.Count(r => r.ExcitabilityClass == 1), ok.Count(r => r.ExcitabilityClass == 2));
        }).ToArray();
}
