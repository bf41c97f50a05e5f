namespace ExprModel.Data.Catalog;

/// <summary>A catalog source or database problem, naming the file and the entry or parameter at fault.</summary>
public sealed class CatalogException(string message, Exception? inner = null) : Exception(message, inner);
