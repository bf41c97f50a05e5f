namespace ExprModel.Core.Expression;

/// <summary>A log transform the user states was applied to the table, so the reader can undo it value by value.</summary>
public enum LogTransform
{
    /// <summary>No transform stated.</summary>
    None,
    /// <summary>ln(1 + x); undone as exp(v) - 1.</summary>
    NaturalLog1p,
    /// <summary>log2(1 + x); undone as 2^v - 1.</summary>
    Log2Plus1,
    /// <summary>log10(1 + x); undone as 10^v - 1.</summary>
    Log10Plus1,
}
