namespace ExprModel.Core.Expression;

/// <summary>
/// An expression table reduced to what modelling needs: the kept genes' values per cell, every cell's library
/// size (sum over all genes in the file, kept or not), the unit and how it was determined, and the orientation.
/// Values are as read (not yet normalised); see <see cref="Normalised"/>.
/// </summary>
public sealed class ExpressionTable
{
    public required string Source { get; init; }
    public required IReadOnlyList<string> CellIds { get; init; }
    /// <summary>Kept gene identifiers exactly as written in the file, to their values per cell (same order as CellIds).</summary>
    public required IReadOnlyDictionary<string, double[]> Genes { get; init; }
    /// <summary>Sum of all values in each cell, over every gene of the file (used for CPM).</summary>
    public required double[] LibrarySizes { get; init; }
    /// <summary>How many genes the file held in all (kept or not).</summary>
    public required int TotalGeneCount { get; init; }
    public required ExpressionUnit Unit { get; init; }
    /// <summary>Says how the unit was determined ("given by the user", "detected: integers with ...").</summary>
    public required string UnitNote { get; init; }
    public required TableOrientation Orientation { get; init; }
    public required string OrientationNote { get; init; }
    /// <summary>How the file was read: format, delimiter, compression ("comma-delimited text, gzip").</summary>
    public string FormatNote { get; init; } = "";
    /// <summary>Warnings a user should read (duplicate ids, dropped rows...).</summary>
    public IReadOnlyList<string> Notes { get; init; } = [];

    /// <summary>
    /// The same table under another name, for a file read from a temporary copy (an upload): the name is what the
    /// built models' derivation and later messages show, so it should be the one the user knows, not a server path.
    /// </summary>
    public ExpressionTable WithSource(string source) => new()
    {
        Source = source,
        CellIds = CellIds,
        Genes = Genes,
        LibrarySizes = LibrarySizes,
        TotalGeneCount = TotalGeneCount,
        Unit = Unit,
        UnitNote = UnitNote,
        Orientation = Orientation,
        OrientationNote = OrientationNote,
        FormatNote = FormatNote,
        Notes = Notes,
    };

    /// <summary>
    /// Values on a common linear scale: CPM for counts (value / library size * 1e6), TPM/FPKM/CPM as given.
    /// Log-transformed tables must be converted by the reader before this is called.
    /// </summary>
    public double[] Normalised(string gene)
    {
        var v = Genes[gene];
        if (Unit == ExpressionUnit.LogTransformed)
            throw new InvalidOperationException($"{Source}: values are log-transformed; undo the transform before normalising.");
        if (Unit != ExpressionUnit.Counts) return v;
        var r = new double[v.Length];
        for (int i = 0; i < v.Length; i++) r[i] = LibrarySizes[i] > 0 ? v[i] / LibrarySizes[i] * 1e6 : 0;
        return r;
    }
}
