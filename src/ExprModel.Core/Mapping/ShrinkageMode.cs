namespace ExprModel.Core.Mapping;

/// <summary>How a single cell's expression is estimated from its counts for a per-cell model.</summary>
public enum ShrinkageMode
{
    /// <summary>The cell's own CPM as read (a zero count switches the channel off).</summary>
    None,
    /// <summary>Empirical-Bayes gamma-Poisson shrinkage towards the cell's group (<see cref="PerCellShrinkage"/>).</summary>
    Group,
}
