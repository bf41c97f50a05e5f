namespace ExprModel.Core.Expression;

/// <summary>A bad expression or metadata file: says which file, line and column (or dataset path) and what is wrong.</summary>
public class ExpressionFormatException(string message) : Exception(message);
