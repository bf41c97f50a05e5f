using System.Globalization;
using ExprModel.Core.Expression.Text;
using ExprModel.Core.Expression.Units;

namespace ExprModel.Core.Expression.MatrixMarket;

/// <summary>
/// Reads a sparse expression matrix in Matrix Market coordinate format (NIST Matrix Market exchange format: header
/// "%%MatrixMarket matrix coordinate real|integer general", a size line "rows columns entries", then one
/// "row column value" line per non-zero, 1-based) with two sidecar files: the row names (genes; tab-separated, first
/// column an id, optional second column a symbol and third a feature type) and the column names (cells). Files may be
/// gzip-compressed. Rows are genes and columns are cells in this layout. Entries may come in any order; memory is the
/// kept genes times cells plus the sidecars. With a cell range the whole file is streamed (entries have no order), but
/// only entries whose column lies in the range are parsed past their indices and kept.
/// </summary>
public static class SparseMatrixReader
{
    /// <summary>The matrix and sidecar files found for a directory or matrix path.</summary>
    public sealed record Layout(string Matrix, string Genes, string Cells);

    private static readonly string[] MatrixNames = ["matrix.mtx", "matrix.mtx.gz"];
    private static readonly string[] GeneNames = ["features.tsv", "features.tsv.gz", "genes.tsv", "genes.tsv.gz"];
    private static readonly string[] CellNames = ["barcodes.tsv", "barcodes.tsv.gz"];

    /// <summary>Finds the three files from a directory, or from the matrix file's own directory.</summary>
    public static Layout Locate(string path)
    {
        string dir = Directory.Exists(path) ? path : Path.GetDirectoryName(Path.GetFullPath(path))!;
        string? matrix = Directory.Exists(path) ? First(dir, MatrixNames) : path;
        if (matrix is null || !File.Exists(matrix))
            throw new ExpressionFormatException($"{Path.GetFileName(path)}: no matrix.mtx or matrix.mtx.gz in {dir}.");
        string genes = First(dir, GeneNames)
            ?? throw new ExpressionFormatException($"{Path.GetFileName(matrix)}: no features.tsv[.gz] or genes.tsv[.gz] beside it in {dir}.");
        string cells = First(dir, CellNames) ?? throw new ExpressionFormatException($"{Path.GetFileName(matrix)}: no barcodes.tsv[.gz] beside it in {dir}.");
        return new Layout(matrix, genes, cells);
    }

    private static string? First(string dir, string[] names) =>
        names.Select(n => Path.Combine(dir, n)).FirstOrDefault(File.Exists);

    public static ExpressionTable Read(string path, ExpressionReadOptions? options = null) => Read(Locate(path), options);

    public static ExpressionTable Read(Layout layout, ExpressionReadOptions? options = null)
    {
        var o = options ?? ExpressionReadOptions.Default;
        var notes = new List<string>();
        var (geneNames, isGene) = ReadGenes(layout.Genes, o, notes);
        var (cellIds, totalCells) = ReadCells(layout.Cells, o);
        var range = o.Cells ?? new CellRange(0, totalCells);

        string file = Path.GetFileName(layout.Matrix);
        using var r = new RecordReader(InputFile.Open(layout.Matrix, o.MaxDecompressedBytes, o.Meter), file, ' ', o.MaxRecordChars, 64, long.MaxValue,
            o.Cancel)
        {
            WhitespaceDelimited = true,
        };
        if (!r.ReadRecord()) throw new ExpressionFormatException($"{file}: line 1: the file is empty.");
        CheckBanner(r, file);
        // Skip comments up to the size line.
        bool haveSize;
        while ((haveSize = r.ReadRecord()) && r.Field(0).StartsWith("%")) { }
        if (!haveSize) throw new ExpressionFormatException($"{file}: line {r.LineNumber}: no size line (rows columns entries) after the header.");
        if (r.FieldCount != 3) throw r.Error(Math.Min(r.FieldCount, 3) + 1, $"size line must be 'rows columns entries', found {r.FieldCount} fields.");
        long rows = ParseCount(r, 0, "rows"), cols = ParseCount(r, 1, "columns"), entries = ParseCount(r, 2, "entries");
        if (rows != geneNames.Count)
            throw r.Error(1, $"{rows} rows but {Path.GetFileName(layout.Genes)} lists {geneNames.Count} genes (mismatched sidecar).");
        if (cols != totalCells)
            throw r.Error(2, $"{cols} columns but {Path.GetFileName(layout.Cells)} lists {totalCells} cells (mismatched sidecar).");
        if (entries > rows * cols)
            throw r.Error(3, $"{entries} entries cannot fit a {rows} x {cols} matrix.");

        var registry = new GeneRegistry(Path.GetFileName(layout.Genes), o, notes);
        var slot = new double[]?[geneNames.Count];
        var genes = new Dictionary<string, double[]>(StringComparer.Ordinal);
        for (int g = 0; g < geneNames.Count; g++)
        {
            if (!isGene[g]) continue;
            if (registry.Add(geneNames[g], $"line {g + 1}"))
                genes.Add(geneNames[g], slot[g] = new double[cellIds.Count]);
        }
        registry.Finish();

        var library = new double[cellIds.Count];
        var stats = new ValueStats { WholeTolerance = o.LogTransform == LogTransform.None ? 0 : 1e-6 };
        long seen = 0, inRange = 0;
        while (r.ReadRecord())
        {
            if (r.Field(0).StartsWith("%")) continue;
            if (r.FieldCount != 3) throw r.Error(Math.Min(r.FieldCount, 3) + 1, $"an entry must be 'row column value', found {r.FieldCount} fields.");
            if (++seen > entries) throw r.Error(1, $"more entries than the {entries} the size line declares.");
            long i = ParseIndex(r, 0, rows, "row"), j = ParseIndex(r, 1, cols, "column");
            if (!range.Contains(j - 1)) continue;
            int cell = (int)(j - 1 - range.Start);
            inRange++;
            o.Meter?.AddValues(1);
            var problem = ValueParser.TryParse(r.Field(2), out double v);
            if (problem is not null) throw r.Error(3, $"{problem}.");
            if (o.LogTransform != LogTransform.None) v = ValueParser.Undo(v, o.LogTransform);
            if (!isGene[i - 1]) continue;
            stats.Add(v);
            library[cell] += v;
            if (slot[i - 1] is { } s)
            {
                // Coordinate entries name each position once; a repeat would be silently summed, so refuse it
                // (detectable for kept genes, whose values are held; a repeated zero cannot be told apart).
                if (s[cell] != 0) throw r.Error(1, $"entry ({i}, {j}) appears a second time.");
                s[cell] = v;
            }
        }
        if (seen < entries)
            throw new ExpressionFormatException($"{file}: line {r.LineNumber + 1}: " +
                $"the size line declares {entries} entries but the file ends after {seen} (truncated?).");
        // Zeros are implicit in a sparse matrix, so count them for the unit statistics.
        if (inRange < rows * range.Count) stats.Add(0);
        if (o.Cells is not null) notes.Add($"read {range} of {totalCells} (a part of the file); a unit not stated is decided from these cells' values.");

        var (unit, unitNote) = UnitDecision.Decide(file, o, stats, library, notes);
        return new ExpressionTable
        {
            Source = layout.Matrix,
            CellIds = cellIds,
            Genes = genes,
            LibrarySizes = library,
            TotalGeneCount = registry.Total,
            Unit = unit,
            UnitNote = unitNote,
            Orientation = TableOrientation.GenesAsRows,
            OrientationNote = "genes as rows: fixed by the Matrix Market layout (rows named by the gene sidecar, columns by the cell sidecar)",
            FormatNote =
                $"Matrix Market coordinate matrix {Path.GetFileName(layout.Matrix)} with {Path.GetFileName(layout.Genes)} and {Path.GetFileName(layout.Cells)}",
            Notes = notes,
        };
    }

    private static void CheckBanner(RecordReader r, string file)
    {
        if (r.FieldCount < 5 || !r.Field(0).Equals("%%MatrixMarket", StringComparison.OrdinalIgnoreCase))
            throw new ExpressionFormatException($"{file}: line 1: not a Matrix Market file (expected '%%MatrixMarket matrix coordinate real general').");
        string Lower(int k) => r.FieldString(k).ToLowerInvariant();
        if (Lower(1) != "matrix" || Lower(2) != "coordinate")
            throw new ExpressionFormatException($"{file}: line 1: only 'matrix coordinate' Matrix Market files are read, " +
                $"found '{r.FieldString(1)} {r.FieldString(2)}'.");
        if (Lower(3) is not ("real" or "integer" or "double"))
            throw new ExpressionFormatException($"{file}: line 1: value type '{r.FieldString(3)}' is not read (real or integer only).");
        if (Lower(4) != "general")
            throw new ExpressionFormatException($"{file}: line 1: symmetry '{r.FieldString(4)}' is not read (an expression matrix is 'general').");
    }

    private static long ParseCount(RecordReader r, int field, string what)
    {
        if (!long.TryParse(r.Field(field), NumberStyles.None, CultureInfo.InvariantCulture, out long n))
            throw r.Error(field + 1, $"{what} count '{ValueParser.Shorten(r.Field(field))}' is not a whole number.");
        return n;
    }

    private static long ParseIndex(RecordReader r, int field, long max, string what)
    {
        if (!long.TryParse(r.Field(field), NumberStyles.None, CultureInfo.InvariantCulture, out long k))
            throw r.Error(field + 1, $"{what} index '{ValueParser.Shorten(r.Field(field))}' is not a whole number.");
        if (k < 1 || k > max) throw r.Error(field + 1, $"{what} index {k} is outside 1..{max}.");
        return k;
    }

    private static (List<string> Names, bool[] IsGene) ReadGenes(string path, ExpressionReadOptions o, List<string> notes)
    {
        string file = Path.GetFileName(path);
        var names = new List<string>();
        var isGene = new List<bool>();
        int otherTypes = 0;
        using var r = new RecordReader(InputFile.Open(path, o.MaxDecompressedBytes), file, '\t', o.MaxRecordChars, 64, o.MaxLines, o.Cancel);
        int? width = null;
        while (r.ReadRecord())
        {
            width ??= r.FieldCount;
            if (r.FieldCount != width)
                throw r.Error(Math.Min(r.FieldCount, width.Value) + 1, $"{r.FieldCount} fields where the first line has {width} (ragged sidecar).");
            int column = o.FeatureColumn ?? (r.FieldCount >= 2 ? 2 : 1);
            if (column < 1 || column > r.FieldCount) throw r.Error(r.FieldCount + 1, $"no column {column} to take gene identifiers from.");
            names.Add(r.FieldString(column - 1));
            // A third column gives the feature type; only gene expression rows count as genes.
            bool gene = r.FieldCount < 3 || r.Field(2).Equals("Gene Expression", StringComparison.OrdinalIgnoreCase);
            if (!gene) otherTypes++;
            isGene.Add(gene);
        }
        if (names.Count == 0) throw new ExpressionFormatException($"{file}: line 1: the gene sidecar is empty.");
        if (otherTypes > 0) notes.Add($"{file}: {otherTypes} rows are not gene expression features (third column); left out of genes and library sizes.");
        return (names, isGene.ToArray());
    }

    /// <summary>The cell ids of the range (every cell without one) and how many cells the sidecar lists.</summary>
    private static (List<string> Cells, int Total) ReadCells(string path, ExpressionReadOptions o)
    {
        string file = Path.GetFileName(path);
        var cells = new List<string>();
        var registry = new CellRegistry(file);
        int total = 0;
        using var r = new RecordReader(InputFile.Open(path, o.MaxDecompressedBytes), file, '\t', o.MaxRecordChars, 64, o.MaxLines, o.Cancel);
        while (r.ReadRecord())
        {
            if (o.Cells is { } range && !range.Contains(total)) { total++; continue; }
            total++;
            string id = r.FieldString(0);
            registry.Add(id, $"line {r.LineNumber}, column 1");
            cells.Add(id);
        }
        if (total == 0) throw new ExpressionFormatException($"{file}: line 1: the cell sidecar is empty.");
        o.Cells?.CheckWithin(total, file);
        return (cells, total);
    }

    /// <summary>How many cells the matrix holds: the lines of its cell sidecar.</summary>
    public static int CountCells(string path, ExpressionReadOptions? options = null)
    {
        var o = (options ?? ExpressionReadOptions.Default) with { Cells = null };
        var layout = Locate(path);
        string file = Path.GetFileName(layout.Cells);
        int total = 0;
        using var r = new RecordReader(InputFile.Open(layout.Cells, o.MaxDecompressedBytes), file, '\t', o.MaxRecordChars, 64, o.MaxLines, o.Cancel);
        while (r.ReadRecord()) total++;
        if (total == 0) throw new ExpressionFormatException($"{file}: line 1: the cell sidecar is empty.");
        return total;
    }
}
