using ExprModel.Core.Expression;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>What the user chose on the Load page; null or empty means "detect".</summary>
/// <param name="Matrix">For .h5ad uploads: X, layer:NAME or raw (AnnData's own names); null reads X.</param>
public sealed record ReadChoices(string? Orientation, string? Unit, string? GroupColumn, string? Matrix = null)
{
    /// <summary>The library's reading of the choices (<see cref="ReadOptionsParser"/>); a bad one is the user's to fix.</summary>
    public ExpressionReadOptions ToOptions()
    {
        try { return ReadOptionsParser.Parse(Orientation, Unit, matrix: Matrix); }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
    }
}
