namespace ExprModel.Web.Workspace;

/// <summary>Orientation, unit and grouping as confirmed on the Load page; empty strings mean "detect" or "none".</summary>
public sealed class IntakeChoices
{
    public string Orientation { get; set; } = "";
    public string Unit { get; set; } = "";
    public string GroupColumn { get; set; } = "";
    /// <summary>For an .h5ad upload: X, layer:NAME or raw (<see cref="ReadChoices.Matrix"/>); empty reads X with the log-transform hint.</summary>
    public string Matrix { get; set; } = "";
}
