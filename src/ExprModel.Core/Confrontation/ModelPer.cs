namespace ExprModel.Core.Confrontation;

/// <summary>Which model predicts a recorded cell: one built from the cell's own expression, or its group's.</summary>
public enum ModelPer { Cell, Group }
