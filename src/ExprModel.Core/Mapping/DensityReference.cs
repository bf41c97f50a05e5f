namespace ExprModel.Core.Mapping;

/// <summary>What an entry's expression is divided by.</summary>
public enum DensityReference
{
    /// <summary>The median over every cell of the dataset (falls back to the mean when the median is zero).</summary>
    DatasetMedian,
    /// <summary>The mean over the cells of a user-chosen reference group.</summary>
    ReferenceGroup,
}
