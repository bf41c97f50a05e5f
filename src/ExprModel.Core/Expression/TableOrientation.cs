namespace ExprModel.Core.Expression;

/// <summary>Which axis of the file holds genes.</summary>
public enum TableOrientation { GenesAsRows, CellsAsRows }
