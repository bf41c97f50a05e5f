using ExprModel.Core.Expression;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>What the user chose on the Load page; null or empty means "detect".</summary>
public sealed record ReadChoices(string? Orientation, string? Unit, string? GroupColumn)
{
    /// <summary>The library's reading of the choices (<see cref="ReadOptionsParser"/>); a bad one is the user's to fix.</summary>
    public ExpressionReadOptions ToOptions()
    {
        try { return ReadOptionsParser.Parse(Orientation, Unit); }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
    }
}
