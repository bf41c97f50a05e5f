namespace ExprModel.Core.Expression;

/// <summary>
/// An input passed one of the reader's size limits (<see cref="ExpressionReadOptions.MaxDecompressedBytes"/>,
/// <see cref="ExpressionReadOptions.MaxLines"/>): the message names the file, where reading stopped and the limit. A
/// server answers it as "too large" rather than "malformed".
/// </summary>
public sealed class ExpressionLimitException(string message) : ExpressionFormatException(message);
