namespace ExprModel.Core.Recordings;

/// <summary>A recording that cannot be read: the message names the file and the dataset path (NWB) or line and column (CSV).</summary>
public sealed class RecordingFormatException(string message) : Exception(message);
