namespace ExprModel.Cli;

/// <summary>A usage problem the user can fix (names the option).</summary>
public sealed class CliException(string message) : Exception(message);
