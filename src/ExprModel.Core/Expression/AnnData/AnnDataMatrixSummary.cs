namespace ExprModel.Core.Expression.AnnData;

/// <summary>
/// One matrix of an AnnData file as a user picks it (X, a layer or raw/X): how it is stored, its shape, and what its
/// first stored values look like (at most 65,536 of them are read, so this costs little even for an atlas).
/// </summary>
/// <param name="Layout">dense, csr_matrix or csc_matrix (the group's encoding-type), as the file says.</param>
/// <param name="Shape">cells x genes as the file states it, or null when it does not.</param>
/// <param name="Sampled">How many stored values were looked at (the first ones).</param>
/// <param name="AllWhole">Every value looked at is a whole number (counts look like this).</param>
/// <param name="Largest">The largest value looked at (0 when none was).</param>
public sealed record AnnDataMatrixSummary(MatrixChoice Choice, string Layout, long[]? Shape, int Sampled, bool AllWhole, double Largest)
{
    /// <summary>Whole numbers, at least one not zero: what the log-transform hint looks for in the other matrices.</summary>
    public bool LooksLikeCounts => Sampled > 0 && AllWhole && Largest > 0;
}
