namespace ExprModel.Core.Mapping;

/// <summary>Cells grouped by a metadata label (e.g. transcriptomic type).</summary>
public sealed class CellGroups
{
    public IReadOnlyDictionary<string, int[]> Members { get; }
    public string Column { get; }

    public CellGroups(IReadOnlyList<string> cellIds, IReadOnlyDictionary<string, string> labelByCell, string column)
    {
        Column = column;
        var m = new SortedDictionary<string, List<int>>(StringComparer.Ordinal);
        for (int i = 0; i < cellIds.Count; i++)
            if (labelByCell.TryGetValue(cellIds[i], out var g) && !string.IsNullOrWhiteSpace(g))
            {
                if (!m.TryGetValue(g, out var list)) m[g] = list = [];
                list.Add(i);
            }
        Members = m.ToDictionary(p => p.Key, p => p.Value.ToArray(), StringComparer.Ordinal);
    }

    public static GroupStatistic Statistic(string group, int[] members, double[] values)
    {
        if (members.Length == 0) return new(group, 0, 0, 0, 0);
        double mean = members.Average(i => values[i]);
        double sd = members.Length > 1 ? Math.Sqrt(members.Sum(i => (values[i] - mean) * (values[i] - mean)) / (members.Length - 1)) : 0;
        double frac = members.Count(i => values[i] > 0) / (double)members.Length;
        return new(group, members.Length, mean, sd, frac);
    }
}
