namespace ExprModel.Core.Cell;

/// <summary>How an injected current is expressed: as density or as an absolute current for this cell's area.</summary>
public enum CurrentUnit { UaPerCm2, Pa, Na }
