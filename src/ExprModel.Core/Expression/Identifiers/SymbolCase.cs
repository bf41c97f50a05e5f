namespace ExprModel.Core.Expression.Identifiers;

/// <summary>How a symbol is written: HGNC human symbols are upper case; mouse and rat symbols are capitalised.</summary>
public enum SymbolCase { HumanUpper, RodentCapitalised, Other }
