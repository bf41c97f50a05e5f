namespace ExprModel.Data.Store;

/// <summary>A snapshot request the store refuses (unknown parent, oversize notes...), with the field at fault.</summary>
public sealed class SnapshotException(string message) : Exception(message);
