namespace ExprModel.Core.Expression.AnnData;

/// <summary>
/// Which matrix of an AnnData file holds the values to model. The AnnData on-disk layout keeps the main matrix in
/// <c>X</c>, further matrices of the same shape under <c>layers/NAME</c>, and an earlier state (often the unfiltered,
/// untransformed counts) in <c>raw/X</c> with its own gene table <c>raw/var</c>. Atlases commonly keep normalised,
/// log-transformed values in X and counts in a layer or in raw (common practice).
/// </summary>
public sealed record MatrixChoice
{
    /// <summary>HDF5 path of the matrix (dataset or sparse group), without the leading slash.</summary>
    public required string MatrixPath { get; init; }

    /// <summary>The data frame naming the matrix's genes: var, or raw/var for raw/X.</summary>
    public required string GeneFrame { get; init; }

    /// <summary>How a user writes this choice: X, layer:NAME or raw.</summary>
    public required string Spelling { get; init; }

    public static MatrixChoice X { get; } = new() { MatrixPath = "X", GeneFrame = "var", Spelling = "X" };

    public static MatrixChoice Raw { get; } = new() { MatrixPath = "raw/X", GeneFrame = "raw/var", Spelling = "raw" };

    public static MatrixChoice Layer(string name)
    {
        if (string.IsNullOrWhiteSpace(name) || name.Contains('/'))
            throw new ArgumentException($"layer name '{name}' must be a non-empty name without '/'.", nameof(name));
        return new() { MatrixPath = "layers/" + name, GeneFrame = "var", Spelling = "layer:" + name };
    }

    public override string ToString() => Spelling;
}
