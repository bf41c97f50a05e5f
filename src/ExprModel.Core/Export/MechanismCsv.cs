using System.Globalization;
using System.Text.Json.Nodes;
using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Models;

namespace ExprModel.Core.Export;

/// <summary>
/// The adaptation-mechanism read-outs (<see cref="MechanismReport"/>) as CSV and JSON, the same files from the command line,
/// the API and the web app. CSV: caution, model, step, trends and threshold probes as comment lines, then one row per spike
/// (threshold, trough, after-hyperpolarisation depth, interval, each channel's mean inter-spike ramp current in the chosen unit).
/// </summary>
public static class MechanismCsv
{
    public static string Write(string modelName, MechanismReport r, CurrentUnit unit, Geometry geometry)
    {
        string suffix = CurrentUnits.Suffix(unit);
        double I(double density) => CurrentUnits.FromDensity(density, unit, geometry);
        var header = new List<string> { "spike", "time_ms", "threshold_mv", "trough_mv", "ahp_depth_mv", "interval_ms" };
        header.AddRange(r.ChannelLabels.Select(l => $"ramp_current_{l}_{suffix}"));
        var csv = CsvTable.ForModel(modelName, header, [.. Summary(r, unit, geometry)]);
        foreach (var s in r.Spikes)
        {
            var row = new List<object?> { s.Index, s.TimeMs, s.ThresholdMv, s.TroughMv, s.AfterHyperpolarisationMv, s.IntervalMs };
            for (int c = 0; c < r.ChannelLabels.Count; c++) row.Add(s.RampCurrentsUaPerCm2 is { } cur ? I(cur[c]) : null);
            csv.Row([.. row]);
        }
        return csv.ToString();
    }

    /// <summary>The trends and probes in words, one line each (CSV comments, notes in the web panel).</summary>
    public static IEnumerable<string> Summary(MechanismReport r, CurrentUnit unit, Geometry geometry)
    {
        string label = CurrentUnits.Label(unit);
        string F(double? x, string fmt = "0.###") => x is { } v ? v.ToString(fmt, CultureInfo.InvariantCulture) : "undefined";
        string A(double? density) => density is { } d ? F(CurrentUnits.FromDensity(d, unit, geometry), "0.####") + " " + label : "undefined";
        yield return $"step: {A(r.StepUaPerCm2)} for {F(r.StepDurationMs)} ms from rest at {F(r.RestMv, "0.##")} mV; {r.Spikes.Count} spikes";
        yield return $"threshold rise (last - first): {F(r.ThresholdRiseMv)} mV; slope {F(r.ThresholdSlopeMvPerSpike, "0.####")} mV per spike";
        yield return $"after-hyperpolarisation change (last - first inter-spike depth): {F(r.AfterHyperpolarisationChangeMv)} mV; " +
            $"slope {F(r.AfterHyperpolarisationSlopeMvPerSpike, "0.####")} mV per spike";
        yield return "channel that builds up (largest outward change of its inter-spike current): " + (r.BuildingUpChannel ?? "none");
        foreach (var p in new[] { r.AfterOneSpike, r.AfterTrain })
            if (p is not null)
                yield return $"pulse threshold {p.Condition} ({F(p.PulseMs)} ms pulse, {F(p.DelayMs)} ms later, membrane at " +
                    $"{F(p.MembraneBeforeMv, "0.##")} mV): {A(p.AfterUaPerCm2)} against {A(p.AtRestUaPerCm2)} at rest (ratio {F(p.CurrentRatio, "0.###")})";
        foreach (var n in r.Notes) yield return "note: " + n;
    }

    public static JsonObject Json(string modelName, MechanismReport r, CurrentUnit unit, Geometry geometry)
    {
        double? I(double? density) => density is { } d ? CurrentUnits.FromDensity(d, unit, geometry) : null;
        JsonObject? Probe(ThresholdProbe? p) => p is null ? null : new JsonObject
        {
            ["condition"] = p.Condition,
            ["pulse_ms"] = p.PulseMs,
            ["delay_ms"] = p.DelayMs,
            ["at_rest"] = I(p.AtRestUaPerCm2),
            ["after"] = I(p.AfterUaPerCm2),
            ["ratio"] = p.CurrentRatio,
            ["membrane_before_mv"] = p.MembraneBeforeMv,
        };
        var spikes = new JsonArray(r.Spikes.Select(s => (JsonNode)new JsonObject
        {
            ["spike"] = s.Index,
            ["time_ms"] = s.TimeMs,
            ["threshold_mv"] = s.ThresholdMv,
            ["trough_mv"] = s.TroughMv,
            ["ahp_depth_mv"] = s.AfterHyperpolarisationMv,
            ["interval_ms"] = s.IntervalMs,
            ["ramp_currents"] = s.RampCurrentsUaPerCm2 is { } c ? new JsonArray(c.Select(x => (JsonNode?)I(x)).ToArray()) : null,
        }).ToArray());
        return new JsonObject
        {
            ["caution"] = ResearchCaution.Text,
            ["model"] = modelName,
            ["units"] = CurrentUnits.Label(unit),
            ["step"] = I(r.StepUaPerCm2),
            ["step_duration_ms"] = r.StepDurationMs,
            ["rest_mv"] = r.RestMv,
            ["channels"] = new JsonArray(r.ChannelLabels.Select(l => (JsonNode?)l).ToArray()),
            ["threshold_rise_mv"] = r.ThresholdRiseMv,
            ["threshold_slope_mv_per_spike"] = r.ThresholdSlopeMvPerSpike,
            ["ahp_change_mv"] = r.AfterHyperpolarisationChangeMv,
            ["ahp_slope_mv_per_spike"] = r.AfterHyperpolarisationSlopeMvPerSpike,
            ["ramp_current_change"] = r.RampCurrentChangeUaPerCm2 is { } ch ? new JsonArray(ch.Select(x => (JsonNode?)I(x)).ToArray()) : null,
            ["building_up"] = r.BuildingUpChannel,
            ["after_one_spike"] = Probe(r.AfterOneSpike),
            ["after_train"] = Probe(r.AfterTrain),
            ["spikes"] = spikes,
            ["notes"] = new JsonArray(r.Notes.Select(n => (JsonNode?)n).ToArray()),
        };
    }
}
