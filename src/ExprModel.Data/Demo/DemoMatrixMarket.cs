using System.Globalization;
using System.Text;

namespace ExprModel.Data.Demo;

/// <summary>
/// The demo counts (<see cref="DemoDataGenerator"/>'s counts.csv, genes x cells) written again as a sparse Matrix Market
/// triple, so the Matrix Market upload path has a real, reproducible example: <c>matrix.mtx</c> (NIST Matrix Market
/// exchange format, "matrix coordinate integer general", 1-based "row column value" lines for the non-zero counts,
/// cell by cell), <c>genes.tsv</c> (one gene name per matrix row, in the table's order, duplicates and alias kept) and
/// <c>barcodes.tsv</c> (one cell id per matrix column). Nothing is drawn here: the values are the seeded table's.
/// </summary>
public static class DemoMatrixMarket
{
    /// <summary>The folder under catalog/demo/ that holds the triple.</summary>
    public const string FolderName = "mtx";
    public const string MatrixFileName = "matrix.mtx";
    public const string GenesFileName = "genes.tsv";
    public const string CellsFileName = "barcodes.tsv";

    /// <summary>The three files' contents.</summary>
    public sealed record Files(string Matrix, string Genes, string Cells);

    /// <summary>Converts a genes x cells CSV of whole counts (the demo's counts.csv) to the triple.</summary>
    public static Files FromCountsCsv(string countsCsv)
    {
        var lines = countsCsv.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l => l.TrimEnd('\r')).ToArray();
        var cells = lines[0].Split(',')[1..];
        var genes = new List<string>();
        var entries = new List<(int Row, int Column, long Value)>();
        for (int row = 1; row < lines.Length; row++)
        {
            var fields = lines[row].Split(',');
            if (fields.Length != cells.Length + 1)
                throw new FormatException($"counts: line {row + 1} has {fields.Length} fields where the header has {cells.Length + 1}.");
            genes.Add(fields[0]);
            for (int c = 1; c < fields.Length; c++)
            {
                long v = long.Parse(fields[c], NumberStyles.None, CultureInfo.InvariantCulture);
                if (v != 0) entries.Add((row, c, v));
            }
        }
        var matrix = new StringBuilder();
        matrix.Append("%%MatrixMarket matrix coordinate integer general\n");
        matrix.Append("% Invented demo counts (catalog/demo/README.md): counts.csv written as a sparse matrix by DemoMatrixMarket.\n");
        matrix.Append(CultureInfo.InvariantCulture, $"{genes.Count} {cells.Length} {entries.Count}\n");
        // Cell by cell (column-major), the order single-cell pipelines usually write.
        foreach (var (row, column, value) in entries.OrderBy(e => e.Column).ThenBy(e => e.Row))
            matrix.Append(CultureInfo.InvariantCulture, $"{row} {column} {value}\n");
        return new Files(matrix.ToString(), string.Concat(genes.Select(g => g + "\n")), string.Concat(cells.Select(c => c + "\n")));
    }

    /// <summary>The triple of the seeded demo dataset.</summary>
    public static Files Generate(int seed = DemoDataGenerator.DefaultSeed) => FromCountsCsv(DemoDataGenerator.Generate(seed).CountsCsv);

    /// <summary>Writes the triple into <paramref name="directory"/> (created if needed) and returns the folder.</summary>
    public static string WriteTo(string directory, int seed = DemoDataGenerator.DefaultSeed)
    {
        Directory.CreateDirectory(directory);
        var files = Generate(seed);
        var utf8 = new UTF8Encoding(false);
        File.WriteAllText(Path.Combine(directory, MatrixFileName), files.Matrix, utf8);
        File.WriteAllText(Path.Combine(directory, GenesFileName), files.Genes, utf8);
        File.WriteAllText(Path.Combine(directory, CellsFileName), files.Cells, utf8);
        return directory;
    }
}
