using System.Text.RegularExpressions;
using ExprModel.Core.Expression.Identifiers;

namespace ExprModel.Core.Expression.Delimited;

/// <summary>
/// Decides which axis of a delimited table holds genes, from (in order of trust) which axis the caller's gene filter
/// recognises, the label in the top-left cell, and which axis looks like gene identifiers. Refuses when the evidence
/// is too weak, rather than guessing.
/// </summary>
internal static partial class OrientationDetector
{
    [GeneratedRegex(@"^(genes?|gene[ _.]?(id|ids|name|names|symbol|symbols)|symbols?|features?|feature[ _.]?(id|name)"
        + @"|ensembl([ _.]?(id|gene|gene[ _.]?id))?|var|var[ _.]?names?)$", RegexOptions.IgnoreCase)]
    private static partial Regex GeneCornerLabel();

    [GeneratedRegex(@"^(cells?|cell[ _.]?(id|ids|name|names|barcode)|barcodes?|samples?|sample[ _.]?(id|name)|obs|obs[ _.]?names?)$", RegexOptions.IgnoreCase)]
    private static partial Regex CellCornerLabel();

    public static bool IsCornerLabel(string text) => GeneCornerLabel().IsMatch(text.Trim()) || CellCornerLabel().IsMatch(text.Trim());

    private const int SampleSize = 200;

    /// <summary>How much more gene-like one axis must look than the other to decide by shape alone.</summary>
    private const double Margin = 0.2;

    public static (TableOrientation Orientation, string Note) Detect(string file, string corner, IReadOnlyList<string> header,
        IReadOnlyList<string> firstColumn, Func<string, bool>? keep)
    {
        if (keep is not null)
        {
            int rowHits = firstColumn.Count(keep), columnHits = header.Count(keep);
            if (rowHits > 0 && columnHits == 0)
                return (TableOrientation.GenesAsRows,
                    $"detected genes as rows: {rowHits} of the first {firstColumn.Count} row names are known genes, no column name is.");
            if (columnHits > 0 && rowHits == 0)
                return (TableOrientation.CellsAsRows,
                    $"detected cells as rows: {columnHits} column names are known genes, none of the first {firstColumn.Count} row names is.");
        }
        var label = corner.Trim();
        if (GeneCornerLabel().IsMatch(label))
            return (TableOrientation.GenesAsRows, $"detected genes as rows: the top-left cell says '{label}'.");
        if (CellCornerLabel().IsMatch(label))
            return (TableOrientation.CellsAsRows, $"detected cells as rows: the top-left cell says '{label}'.");
        // Compare like with like: as many header names as row names were probed (at least a few hundred).
        double rows = GeneIdentifiers.GeneLikeness(firstColumn);
        double cols = GeneIdentifiers.GeneLikeness(header.Take(Math.Max(SampleSize, firstColumn.Count)).ToList());
        if (rows - cols >= Margin)
            return (TableOrientation.GenesAsRows,
                $"detected genes as rows: row names look like gene identifiers (score {rows:F2} against {cols:F2} for column names).");
        if (cols - rows >= Margin)
            return (TableOrientation.CellsAsRows,
                $"detected cells as rows: column names look like gene identifiers (score {cols:F2} against {rows:F2} for row names).");
        throw new ExpressionFormatException(
            $"{file}: line 1, column 1: cannot tell whether genes are rows or columns (gene-likeness {rows:F2} for row names, {cols:F2} for column names); " +
                "state the orientation.");
    }
}
