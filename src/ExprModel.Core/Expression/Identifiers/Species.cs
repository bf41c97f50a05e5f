namespace ExprModel.Core.Expression.Identifiers;

/// <summary>Species whose gene symbols the catalog links (case conventions differ: human upper case, rodent capitalised).</summary>
public enum Species { Human, Mouse, Rat }
