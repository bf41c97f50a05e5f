using System.Text.Json.Nodes;
using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Export;

/// <summary>Read-outs as a JSON document (used by the CLI's features command and the HTTP API alike).</summary>
public static class ReadoutJson
{
    public static JsonObject Write(ModelDocument doc, CompiledCell cell, CellReadouts r, CurrentUnit unit)
    {
        var g = cell.Model.Geometry;
        var values = new JsonObject();
        foreach (var (name, u, v) in r.Rows())
            values[name] = new JsonObject { ["value"] = v is { } x && double.IsFinite(x) ? x : null, ["unit"] = u };
        var fi = new JsonArray(r.FiCurve.Select(p => (JsonNode)new JsonObject
        {
            ["amplitude"] = CurrentUnits.FromDensity(p.CurrentUaPerCm2, unit, g),
            ["spike_count"] = p.SpikesInStep,
            ["whole_step_rate_hz"] = p.WholeStepRateHz,
            ["first_isi_rate_hz"] = p.FirstIsiRateHz,
            ["late_rate_hz"] = p.LateRateHz,
        }).ToArray());
        return new JsonObject
        {
            ["caution"] = ResearchCaution.Text,
            ["model"] = doc.Name,
            ["area_um2"] = g.AreaUm2,
            ["temperature_c"] = cell.Model.TemperatureC,
            ["fi_units"] = CurrentUnits.Label(unit),
            ["readouts"] = values,
            ["fi_curve"] = fi,
            ["notes"] = new JsonArray(r.Notes.Select(n => (JsonNode)JsonValue.Create(n)!).ToArray()),
        };
    }
}
