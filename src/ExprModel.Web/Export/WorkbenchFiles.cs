using ExprModel.Core.Models;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Export;

/// <summary>The Workbench's exports (each carries the research-use caution): model JSON, trace, f-I and read-out CSV; null when there is nothing to export
/// yet.</summary>
public static class WorkbenchFiles
{
    /// <summary>The model's name as a file name stem: letters and digits, other characters as dashes, lower case.</summary>
    public static string Stem(WorkbenchSession s) =>
        new string((s.Model?.Name ?? "model").Select(c => char.IsLetterOrDigit(c) ? c : '-').ToArray()).Trim('-').ToLowerInvariant();

    /// <summary>The model as the controls set it, every entry pinned to its catalog version.</summary>
    /// <exception cref="UserInputException">An entry does not resolve.</exception>
    public static DownloadFile Model(WorkbenchSession s, ModelRunner runner)
    {
        var doc = runner.Pin(s.Current()) with { Caution = ResearchCaution.Text };
        return new(Stem(s) + ".model.json", "application/json", doc.ToJson());
    }

    public static DownloadFile? Trace(WorkbenchSession s) =>
        s.Step is null ? null : new(Stem(s) + ".trace.csv", "text/csv", CsvExport.Trace(s.Model!.Name, s.Step));

    public static DownloadFile? Fi(WorkbenchSession s) =>
        s.FiRows is null ? null : new(Stem(s) + ".fi.csv", "text/csv", CsvExport.Fi(s.Model!.Name, s.FiRows));

    /// <summary>The pinned variants' read-outs and the live ones ("now"), one column each.</summary>
    public static DownloadFile? Readouts(WorkbenchSession s)
    {
        if (s.Table.Rows is null) return null;
        var columns = s.Variants.Items.Select(v => (v.Name, v.Readouts)).Append(("now", s.Table.Rows)).ToList();
        return new(Stem(s) + ".readouts.csv", "text/csv", CsvExport.Readouts(columns));
    }
}
