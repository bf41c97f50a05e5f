using System.Globalization;
using System.Text;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Export;

/// <summary>
/// CSV files the app hands out. Each starts with a comment line carrying the research-use caution. Text cells that a
/// spreadsheet would run as a formula (starting with =, +, -, @, tab or carriage return) get a leading apostrophe
/// (common practice for formula injection); numbers are written by us in invariant culture and never need it.
/// </summary>
public static class CsvExport
{
    public static string CautionLine => "# " + ResearchCaution.Text;

    /// <summary>Makes a text cell safe: neutralises formula starts, then quotes it if it holds a comma, quote or line break.</summary>
    public static string Cell(string? text)
    {
        var s = text ?? "";
        if (s.Length > 0 && s[0] is '=' or '+' or '-' or '@' or '\t' or '\r') s = "'" + s;
        if (s.IndexOfAny([',', '"', '\n', '\r']) >= 0) s = "\"" + s.Replace("\"", "\"\"") + "\"";
        return s;
    }

    public static string Number(double? x) => x is { } v && double.IsFinite(v) ? v.ToString("R", CultureInfo.InvariantCulture) : "";

    public static string Trace(string modelName, StepView view)
    {
        var sb = Start(modelName);
        sb.Append("time_ms,voltage_mv,stimulus_ua_per_cm2\n");
        for (int i = 0; i < view.FullTimeMs.Length; i++)
            sb.Append(Number(view.FullTimeMs[i])).Append(',').Append(Number(view.FullVoltageMv[i])).Append(',').Append(Number(view.FullStimulusUaPerCm2[i])).Append('\n');
        return sb.ToString();
    }

    public static string Fi(string modelName, IReadOnlyList<FiRow> rows)
    {
        var sb = Start(modelName);
        sb.Append("current_ua_per_cm2,spike_count,whole_step_rate_hz,first_isi_rate_hz,late_rate_hz\n");
        foreach (var r in rows)
            sb.Append(Number(r.CurrentUaPerCm2)).Append(',').Append(r.SpikeCount.ToString(CultureInfo.InvariantCulture)).Append(',')
              .Append(Number(r.WholeStepRateHz)).Append(',').Append(Number(r.FirstIsiRateHz)).Append(',').Append(Number(r.LateRateHz)).Append('\n');
        return sb.ToString();
    }

    /// <summary>Read-outs of one or more variants side by side (one column per variant).</summary>
    public static string Readouts(IReadOnlyList<(string Variant, IReadOnlyList<ReadoutRow> Rows)> variants)
    {
        var sb = Start(string.Join(" | ", variants.Select(v => v.Variant)));
        sb.Append("readout,unit");
        foreach (var v in variants) sb.Append(',').Append(Cell(v.Variant));
        sb.Append('\n');
        var names = variants.SelectMany(v => v.Rows.Select(r => (r.Name, r.Unit))).Distinct().ToList();
        foreach (var (name, unit) in names)
        {
            sb.Append(Cell(name)).Append(',').Append(Cell(unit));
            foreach (var v in variants) sb.Append(',').Append(Number(v.Rows.FirstOrDefault(r => r.Name == name)?.Value));
            sb.Append('\n');
        }
        return sb.ToString();
    }

    private static StringBuilder Start(string modelName) =>
        new StringBuilder().Append(CautionLine).Append('\n').Append("# model: ").Append(modelName.Replace('\n', ' ').Replace('\r', ' ')).Append('\n');
}
