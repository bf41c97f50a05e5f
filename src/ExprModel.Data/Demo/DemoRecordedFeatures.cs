using System.Globalization;
using ExprModel.Core.Cell;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Export;
using ExprModel.Core.Recordings;

namespace ExprModel.Data.Demo;

/// <summary>
/// The demo's recorded-features table that agrees with its recordings: every demo recording measured with
/// <see cref="RecordingFeatures"/> (the simulator's definitions), one row per recorded cell, headers with units as
/// <see cref="ReadoutMatcher"/> reads them ("input resistance (MOhm)", "rheobase (pA)"). The demo metadata's recorded
/// columns are invented group-typical values and disagree with the recordings by design; this table does not. Values
/// are rounded to six significant digits, so the file does not hang on the last bits of the arithmetic.
/// </summary>
public static class DemoRecordedFeatures
{
    public const string FileName = "recorded-features.csv";

    /// <summary>The table's text, measured from the recordings under <paramref name="demoDirectory"/>/recordings.</summary>
    public static string Create(string demoDirectory)
    {
        var measured = RecordingReader.Read(Path.Combine(demoDirectory, DemoRecordingGenerator.DirectoryName))
            .Select(c => RecordingFeatures.Measure(c)).OrderBy(r => r.CellId, StringComparer.Ordinal).ToArray();
        var columns = measured[0].Rows().Where(Kept).Select(r => (r.Name, r.Unit)).ToArray();
        var csv = new CsvTable([], ["cell_id", .. columns.Select(c => $"{c.Name.Replace('_', ' ')} ({c.Unit})"), "recording", "notes"]);
        foreach (var r in measured)
        {
            var values = r.Rows().Where(Kept).Select(x => x.Value is { } v && double.IsFinite(v) ? (object?)Round(v) : null);
            csv.Row([r.CellId, .. values, r.Source, string.Join(" | ", r.Readouts.Notes)]);
        }
        return csv.ToString();
    }

    /// <summary>Writes the table into <paramref name="demoDirectory"/> and returns its path.</summary>
    public static string WriteTo(string demoDirectory)
    {
        var path = Path.Combine(demoDirectory, FileName);
        File.WriteAllText(path, Create(demoDirectory));
        return path;
    }

    /// <summary>Read-outs a recording measures (not current densities: a recording has no area), and the step spacing that bounds the rheobase.</summary>
    private static bool Kept((string Name, string Unit, double? Value) row) =>
        row.Name == "rheobase_step_spacing" ||
        (ReadoutMatcher.Readouts.Any(r => r.Name == row.Name)
            && MeasurementUnits.Parse(row.Unit)!.Quantity is not (Quantity.CurrentDensity or Quantity.RatePerCurrentDensity));

    private static double Round(double v) => double.Parse(v.ToString("G6", CultureInfo.InvariantCulture), CultureInfo.InvariantCulture);
}
