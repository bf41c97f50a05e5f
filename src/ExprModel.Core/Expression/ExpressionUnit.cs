namespace ExprModel.Core.Expression;

/// <summary>What the numbers in an expression table mean.</summary>
public enum ExpressionUnit
{
    /// <summary>Raw read or UMI counts; normalised to CPM by each cell's library size.</summary>
    Counts,
    /// <summary>Counts per million.</summary>
    Cpm,
    /// <summary>Transcripts per million (accepted as given).</summary>
    Tpm,
    /// <summary>FPKM or RPKM (accepted as given).</summary>
    Fpkm,
    /// <summary>log(1 + CPM) or log2(1 + x) style values; undone before use, or refused with a reason.</summary>
    LogTransformed,
}
