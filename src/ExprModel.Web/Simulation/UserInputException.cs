namespace ExprModel.Web.Simulation;

/// <summary>A model or protocol the user must fix, with the field at fault (shown as a 400 ProblemDetails or a page message).</summary>
public sealed class UserInputException(string message) : Exception(message);
