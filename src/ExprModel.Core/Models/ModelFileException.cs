namespace ExprModel.Core.Models;

/// <summary>A model file that cannot be read, with file, line and field.</summary>
public sealed class ModelFileException(string message) : Exception(message);
