using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;

namespace ExprModel.Core.Export;

/// <summary>
/// An f-I curve as CSV, the same file from the command line and the web app: caution and model name as comments, then
/// one row per step amplitude (in the chosen current unit) with spike count, the three rates and the first-spike latency.
/// </summary>
public static class FiCsv
{
    /// <param name="geometry">The cell's geometry, needed only to write amplitudes in pA or nA.</param>
    public static string Write(string modelName, IEnumerable<FiPoint> points, CurrentUnit unit = CurrentUnit.UaPerCm2, Geometry? geometry = null)
    {
        if (unit != CurrentUnit.UaPerCm2 && geometry is null)
            throw new ArgumentException($"An f-I curve written in {CurrentUnits.Label(unit)} needs the cell's geometry.", nameof(geometry));
        var csv = CsvTable.ForModel(modelName,
            ["amplitude_" + CurrentUnits.Suffix(unit), "spike_count", "whole_step_rate_hz", "first_isi_rate_hz", "late_rate_hz", "first_spike_latency_ms"]);
        foreach (var q in points)
            csv.Row(unit == CurrentUnit.UaPerCm2 ? q.CurrentUaPerCm2 : CurrentUnits.FromDensity(q.CurrentUaPerCm2, unit, geometry!),
                q.SpikesInStep, q.WholeStepRateHz, q.FirstIsiRateHz, q.LateRateHz, q.FirstSpikeLatencyMs);
        return csv.ToString();
    }
}
