using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Export;

/// <summary>
/// The CSV files the app hands out, written with the library's one CSV writer (<see cref="CsvTable"/>: formula
/// neutralisation of text cells, invariant numbers). Each starts with comment lines carrying the research-use caution
/// and the model's name.
/// </summary>
public static class CsvExport
{
    private static string[] Comments(string modelName) => [ResearchCaution.Text, "model: " + modelName];

    public static string Trace(string modelName, StepView view)
    {
        var t = new CsvTable(Comments(modelName), ["time_ms", "voltage_mv", "stimulus_ua_per_cm2"]);
        for (int i = 0; i < view.FullTimeMs.Length; i++) t.Row(view.FullTimeMs[i], view.FullVoltageMv[i], view.FullStimulusUaPerCm2[i]);
        return t.ToString();
    }

    public static string Fi(string modelName, IReadOnlyList<FiRow> rows)
    {
        var t = new CsvTable(Comments(modelName), ["current_ua_per_cm2", "spike_count", "whole_step_rate_hz", "first_isi_rate_hz", "late_rate_hz"]);
        foreach (var r in rows) t.Row(r.CurrentUaPerCm2, r.SpikesInStep, r.WholeStepRateHz, r.FirstIsiRateHz, r.LateRateHz);
        return t.ToString();
    }

    /// <summary>Read-outs of one or more variants side by side (one column per variant, named by the user's variant name).</summary>
    public static string Readouts(IReadOnlyList<(string Variant, IReadOnlyList<ReadoutRow> Rows)> variants)
    {
        var t = new CsvTable(Comments(string.Join(" | ", variants.Select(v => v.Variant))), ["readout", "unit", .. variants.Select(v => v.Variant)]);
        foreach (var (name, unit) in variants.SelectMany(v => v.Rows.Select(r => (r.Name, r.Unit))).Distinct())
            t.Row([name, unit, .. variants.Select(v => (object?)v.Rows.FirstOrDefault(r => r.Name == name)?.Value)]);
        return t.ToString();
    }
}
