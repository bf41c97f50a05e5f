using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;

namespace ExprModel.Core.Export;

/// <summary>
/// Voltage-clamp curves as CSV, the same file from the command line and the web app: one row per command potential,
/// per channel its peak and steady current in the chosen unit, its normalised activation and, with a conditioning
/// family, its normalised steady-state inactivation.
/// </summary>
public static class ClampCsv
{
    public static string Write(string modelName, ClampCurves curves, CurrentUnit unit, Geometry geometry)
    {
        string suffix = CurrentUnits.Suffix(unit);
        var header = new List<string> { "command_mv" };
        foreach (var id in curves.Channels)
        {
            header.AddRange([$"peak_{id}_{suffix}", $"steady_{id}_{suffix}", $"activation_{id}"]);
            if (curves.Inactivation is not null) header.Add($"inactivation_{id}");
        }
        var comments = curves.TestMv is { } test ? new[] { $"inactivation: test step to {test:0.###} mV after each conditioning potential" } : [];
        var csv = CsvTable.ForModel(modelName, header, comments);
        for (int i = 0; i < curves.CommandsMv.Length; i++)
        {
            var row = new List<object?> { curves.CommandsMv[i] };
            foreach (var id in curves.Channels)
            {
                row.Add(CurrentUnits.FromDensity(curves.PeakUaPerCm2[id][i], unit, geometry));
                row.Add(CurrentUnits.FromDensity(curves.SteadyUaPerCm2[id][i], unit, geometry));
                row.Add(curves.Activation[id][i]);
                if (curves.Inactivation is not null) row.Add(curves.Inactivation[id][i]);
            }
            csv.Row([.. row]);
        }
        return csv.ToString();
    }
}
