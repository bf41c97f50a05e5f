using ExprModel.Core.Export;
using ExprModel.Web.Components.Panels;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>What the Workbench says when a share link stores other read-outs than the live table showed.</summary>
public static class StoredReadoutsNote
{
    public static string For(IReadOnlyList<ReadoutChange> changes)
    {
        static string V(double? v, string unit) => v is { } x ? $"{ReadoutDisplay.Format(x, unit)} {unit}" : "none";
        var listed = changes.Take(4).Select(c => $"{c.Name.Replace('_', ' ')} {V(c.Before, c.Unit)} → {V(c.After, c.Unit)}");
        string more = changes.Count > 4 ? $" and {changes.Count - 4} more" : "";
        return "The link stores the read-outs measured from scratch, as the command line and the HTTP API measure them. " +
            $"For this cell they differ from the live table: {string.Join("; ", listed)}{more}. The live table's rheobase search " +
            "started near the previous slider position's rheobase; the two searches can only disagree when spiking is not monotone " +
            "in the step amplitude, as here. The table and the f-I curve now show the stored values.";
    }
}
