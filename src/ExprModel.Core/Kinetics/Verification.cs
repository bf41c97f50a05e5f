namespace ExprModel.Core.Kinetics;

/// <summary>Whether an entry's numbers and citation were checked against the paper or recalled.</summary>
public enum Verification { Recalled, Checked }
