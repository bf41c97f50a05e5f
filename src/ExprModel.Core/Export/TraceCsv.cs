using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Export;

/// <summary>
/// A current-clamp trace as CSV, the same file from the command line and the web app: caution, model name and spike
/// count as comments, then time (rounded to 1 ns, the recording grid's own precision), voltage, the stimulus in the
/// chosen current unit and, when recorded, each channel's current density.
/// </summary>
public static class TraceCsv
{
    /// <param name="comments">More comment lines after the spike count (what the protocol found, say).</param>
    public static string Write(string modelName, Trace trace, CurrentUnit unit, Geometry geometry, IReadOnlyList<string>? comments = null) =>
        Write(modelName, trace.TimeMs, trace.VoltageMv, trace.StimulusUaPerCm2, trace.SpikeTimesMs.Count, unit, geometry, trace.ChannelCurrentsUaPerCm2,
            comments);

    /// <param name="geometry">The cell's geometry, needed only to write the stimulus in pA or nA.</param>
    /// <param name="channelCurrentsUaPerCm2">Per channel label its current density at each sample, or null for none.</param>
    public static string Write(string modelName, double[] timeMs, double[] voltageMv, double[] stimulusUaPerCm2, int spikesInTrace,
        CurrentUnit unit = CurrentUnit.UaPerCm2, Geometry? geometry = null, IReadOnlyDictionary<string, double[]>? channelCurrentsUaPerCm2 = null,
        IReadOnlyList<string>? comments = null)
    {
        if (unit != CurrentUnit.UaPerCm2 && geometry is null)
            throw new ArgumentException($"A trace written in {CurrentUnits.Label(unit)} needs the cell's geometry.", nameof(geometry));
        var currents = channelCurrentsUaPerCm2 ?? new Dictionary<string, double[]>();
        var header = new List<string> { "time_ms", "voltage_mv", "stimulus_" + CurrentUnits.Suffix(unit) };
        header.AddRange(currents.Keys.Select(k => $"current_{k}_ua_per_cm2"));
        var csv = CsvTable.ForModel(modelName, header, [$"spikes: {spikesInTrace}", .. comments ?? []]);
        var columns = currents.Values.ToArray();
        for (int i = 0; i < timeMs.Length; i++)
        {
            var row = new object?[header.Count];
            row[0] = Math.Round(timeMs[i], 6);
            row[1] = voltageMv[i];
            row[2] = unit == CurrentUnit.UaPerCm2 ? stimulusUaPerCm2[i] : CurrentUnits.FromDensity(stimulusUaPerCm2[i], unit, geometry!);
            for (int k = 0; k < columns.Length; k++) row[3 + k] = columns[k][i];
            csv.Row(row);
        }
        return csv.ToString();
    }
}
