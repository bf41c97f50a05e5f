using ExprModel.Core.Mapping;

namespace ExprModel.Core.Export;

/// <summary>
/// The batch read-out table, one row per group or cell, as the command line's batch command and the web app's per-cell
/// batch write it (through the one CSV writer, so the caution comment and formula neutralisation come with it).
/// </summary>
public static class BatchTable
{
    /// <summary>Column names; with <paramref name="withGroup"/> a "group" column follows "item" (per-cell rows of a grouped dataset).</summary>
    public static IReadOnlyList<string> Header(bool withGroup)
    {
        var header = new List<string> { "item_index", "item" };
        if (withGroup) header.Add("group");
        header.AddRange(["cells", "resting_potential_mv", "input_resistance_mohm", "membrane_time_constant_ms", "rheobase_pa", "spike_threshold_mv",
            "spike_half_width_ms"]);
        header.AddRange(BatchReadouts.StandardStepsPa.Select(s => $"rate_at_{s:F0}pa_hz"));
        header.AddRange(["excitability_class", "adaptation_ratio", "adaptation_index", "warnings"]);
        return header;
    }

    /// <param name="comments">Comment lines (the research caution first).</param>
    /// <param name="groupOf">The group of a cell id, when rows are cells of a grouped dataset; null leaves the column out.</param>
    public static CsvTable Create(IEnumerable<BatchRow> rows, IEnumerable<string> comments, Func<string, string?>? groupOf = null)
    {
        var csv = new CsvTable(comments, Header(groupOf is not null));
        foreach (var b in rows)
        {
            var r = b.Readouts;
            var row = new List<object?> { b.Index, b.Item };
            if (groupOf is not null) row.Add(groupOf(b.Item));
            row.AddRange([b.Cells, r?.RestingPotentialMv, r?.InputResistanceMOhm, r?.MembraneTimeConstantMs, r?.RheobasePa, r?.ThresholdMv, r?.HalfWidthMs]);
            row.AddRange(BatchReadouts.StandardStepsPa.Select((_, k) => (object?)(k < b.RatesAtStandardStepsHz.Count ? b.RatesAtStandardStepsHz[k] : null)));
            row.AddRange([r?.ExcitabilityClass, r?.AdaptationRatio, r?.AdaptationIndex, b.Warnings]);
            csv.Row([.. row]);
        }
        return csv;
    }
}
