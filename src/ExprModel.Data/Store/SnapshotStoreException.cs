namespace ExprModel.Data.Store;

/// <summary>
/// The snapshot database cannot be used: missing rights, a damaged or foreign file, or a snapshot whose content no
/// longer matches its checksum. The message names the database file (and the snapshot id when one is at fault) and the
/// reason. Unlike <see cref="SnapshotException"/> this is not the caller's fault: the web app answers it with 503.
/// </summary>
public sealed class SnapshotStoreException(string message, Exception? inner = null) : Exception(message, inner);
