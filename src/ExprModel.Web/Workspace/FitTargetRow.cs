namespace ExprModel.Web.Workspace;

/// <summary>One target as typed in the fit panel: read-out name, value and unit, and the misfit scale (blank = the library's default).</summary>
public sealed class FitTargetRow
{
    public string Readout { get; set; } = "";
    public string Value { get; set; } = "";
    public string Unit { get; set; } = "";
    public string Scale { get; set; } = "";
}
