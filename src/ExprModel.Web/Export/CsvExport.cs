using ExprModel.Core.Analysis;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Export;

/// <summary>
/// The CSV files the app hands out, written by the library's writers (<see cref="CsvTable"/>: formula neutralisation
/// of text cells, invariant numbers; <see cref="TraceCsv"/> and <see cref="FiCsv"/> shared with the command line).
/// Each starts with comment lines carrying the research-use caution and the model's name.
/// </summary>
public static class CsvExport
{
    /// <summary>The step's full-resolution trace, as the command line's simulate command writes it (<see cref="TraceCsv"/>).</summary>
    public static string Trace(string modelName, StepView view) =>
        TraceCsv.Write(modelName, view.FullTimeMs, view.FullVoltageMv, view.FullStimulusUaPerCm2, view.SpikeTimesMs.Count);

    /// <summary>
    /// The f-I sweep, as the command line's fi command writes it (<see cref="FiCsv"/>); the rows carry no first-spike
    /// latency, so that column is blank.
    /// </summary>
    public static string Fi(string modelName, IReadOnlyList<FiRow> rows) =>
        FiCsv.Write(modelName, rows.Select(r => new FiPoint(r.CurrentUaPerCm2, r.SpikesInStep, r.WholeStepRateHz, r.FirstIsiRateHz, r.LateRateHz, null)));

    /// <summary>Read-outs of one or more variants side by side (one column per variant, named by the user's variant name).</summary>
    public static string Readouts(IReadOnlyList<(string Variant, IReadOnlyList<ReadoutRow> Rows)> variants)
    {
        var t = CsvTable.ForModel(string.Join(" | ", variants.Select(v => v.Variant)), ["readout", "unit", .. variants.Select(v => v.Variant)]);
        foreach (var (name, unit) in variants.SelectMany(v => v.Rows.Select(r => (r.Name, r.Unit))).Distinct())
            t.Row([name, unit, .. variants.Select(v => (object?)v.Rows.FirstOrDefault(r => r.Name == name)?.Value)]);
        return t.ToString();
    }
}
