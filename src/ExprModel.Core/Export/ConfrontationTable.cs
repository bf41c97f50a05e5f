using ExprModel.Core.Confrontation;

namespace ExprModel.Core.Export;

/// <summary>
/// Predicted against recorded read-outs as CSV, through the one CSV writer (research caution and formula neutralisation
/// come with it): one row per cell and read-out, then, under the same header, one row per group and read-out (cell
/// column "group mean") and one per read-out across cells (cell and group columns "all cells").
/// </summary>
public static class ConfrontationTable
{
    public static IReadOnlyList<string> Header { get; } =
        ["cell", "group", "model", "readout", "unit", "predicted", "recorded", "difference", "z_score", "cells", "pearson_r", "spearman_r",
            "mean_absolute_error", "bias", "note"];

    /// <param name="comments">Comment lines (the research caution first).</param>
    public static CsvTable Create(ConfrontationResult result, IEnumerable<string> comments)
    {
        var csv = new CsvTable(comments, Header);
        foreach (var c in result.Cells)
            csv.Row(c.CellId, c.Group, c.Model, c.Readout, c.Unit, c.Predicted, c.Recorded, c.Difference, c.ZScore, 1, null, null, null, null, c.Note);
        foreach (var g in result.Groups)
            csv.Row("group mean", g.Group, result.Per == ModelPer.Group ? "group " + g.Group : "cells' own", g.Readout, g.Unit, g.PredictedMean, g.RecordedMean,
                g.Difference, g.ZScore, g.RecordedCells, null, null, null, null, g.Note + (g.RecordedSd is { } sd ? $" recorded SD {sd:G4} {g.Unit}." : ""));
        foreach (var a in result.Agreement)
            csv.Row("all cells", "all cells", null, a.Readout, a.Unit, null, null, null, null, a.Cells, a.PearsonR, a.SpearmanR, a.MeanAbsoluteError,
                a.Bias, "");
        return csv;
    }

    /// <summary>Comment lines describing a comparison: caution, the expression estimate, and every column's match.</summary>
    public static IEnumerable<string> Comments(ConfrontationResult result, string caution, string source)
    {
        yield return caution;
        yield return $"predicted by {(result.Per == ModelPer.Cell ? "each cell's own model" : "each cell's group model")} from {source}; " +
            $"recorded values from {result.Recorded.Source}";
        if (result.ExpressionNote.Length > 0) yield return result.ExpressionNote;
        foreach (var m in result.Recorded.Matches)
            yield return $"column {m.ColumnNumber} '{m.Header}': {(m.Matched ? "" : "not compared: ")}{m.Reason}";
    }
}
