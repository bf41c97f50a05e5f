using System.Globalization;
using System.Text.RegularExpressions;
using ExprModel.Core.Expression.Text;

namespace ExprModel.Core.Expression.Metadata;

/// <summary>
/// Reads a cell metadata table (delimited text as for expression tables): one row per cell, a cell id column, label
/// columns, and numeric columns kept as recorded read-outs with the name and unit from their header.
/// </summary>
public static partial class CellMetadataReader
{
    [GeneratedRegex(@"^(cell|cells|cell[ _.]?(id|name|barcode)|barcode|barcodes|id|sample|sample[ _.]?id|obs[ _.]?names?)$", RegexOptions.IgnoreCase)]
    internal static partial Regex CellIdHeader();

    /// <summary>Spellings of "no value" accepted in a numeric column.</summary>
    internal static readonly HashSet<string> Missing = new(StringComparer.OrdinalIgnoreCase) { "", "NA", "N/A", "NaN", "null", "none", "-" };

    public static CellMetadata Read(string path, CellMetadataOptions? options = null)
    {
        var o = options ?? new CellMetadataOptions();
        string file = Path.GetFileName(path);
        var (delimiter, delimiterName) = DelimiterSniffer.Detect(path, file, o.MaxDecompressedBytes);
        using var r = new RecordReader(InputFile.Open(path, o.MaxDecompressedBytes), file, delimiter, o.MaxRecordChars, o.MaxColumns, o.MaxLines,
            o.Cancel);
        if (!r.ReadRecord()) throw new ExpressionFormatException($"{file}: line 1: the file is empty.");
        var header = Enumerable.Range(0, r.FieldCount).Select(r.FieldString).ToList();
        for (int j = 0; j < header.Count; j++)
        {
            int k = header.FindIndex(h => h == header[j]);
            if (k != j && header[j].Length > 0) throw r.Error(j + 1, $"column '{header[j]}' appears twice (also column {k + 1}).");
        }
        var rows = new List<string[]>();
        var lines = new List<long>();
        while (r.ReadRecord())
        {
            if (r.FieldCount != header.Count)
                throw r.Error(Math.Min(r.FieldCount, header.Count) + 1, $"{r.FieldCount} fields where the header has {header.Count} (ragged row).");
            rows.Add(Enumerable.Range(0, r.FieldCount).Select(r.FieldString).ToArray());
            lines.Add(r.LineNumber);
        }
        if (rows.Count == 0) throw new ExpressionFormatException($"{file}: line 2: the file has a header but no rows.");

        var notes = new List<string> { $"{delimiterName}-delimited text" };
        int idColumn;
        if (o.CellIdColumn is { } named)
        {
            idColumn = header.IndexOf(named);
            if (idColumn < 0) throw new ExpressionFormatException($"{file}: line 1: no column '{named}' for cell ids (have: {string.Join(", ", header)}).");
        }
        else
        {
            idColumn = header.FindIndex(h => CellIdHeader().IsMatch(h.Trim()));
            if (idColumn < 0 && header[0].Trim().Length == 0) idColumn = 0;
            if (idColumn < 0) { idColumn = 0; notes.Add($"no column is named like a cell id; took the first column '{header[0]}'."); }
        }

        var cells = new List<string>(rows.Count);
        var registry = new CellRegistry(file);
        for (int i = 0; i < rows.Count; i++)
        {
            registry.Add(rows[i][idColumn], $"line {lines[i]}, column {idColumn + 1}");
            cells.Add(rows[i][idColumn]);
        }

        var groupSet = o.GroupColumns?.ToHashSet(StringComparer.Ordinal);
        if (groupSet is not null)
            foreach (var g in groupSet)
                if (!header.Contains(g)) throw new ExpressionFormatException($"{file}: line 1: no label column '{g}' (have: {string.Join(", ", header)}).");

        var labels = new Dictionary<string, string?[]>(StringComparer.Ordinal);
        var recorded = new List<RecordedColumn>();
        for (int j = 0; j < header.Count; j++)
        {
            if (j == idColumn) continue;
            var column = rows.Select(row => row[j]).ToArray();
            bool numeric = IsNumeric(column);
            bool asLabel = groupSet?.Contains(header[j]) ?? !numeric;
            if (asLabel)
                labels[header[j]] = column.Select(v => v.Trim().Length == 0 ? null : v).ToArray();
            else if (numeric)
            {
                var (name, unit) = ColumnHeader.Split(header[j]);
                if (unit is null) notes.Add($"column '{header[j]}': numeric but its header states no unit; kept without one.");
                recorded.Add(new RecordedColumn(header[j], name, unit, column.Select(ParseOrNull).ToArray()));
            }
            else
            {
                // A column that is neither chosen as labels nor numeric: say where it stops being numeric.
                int bad =
                    Array.FindIndex(column, v => !Missing.Contains(v.Trim()) && !double.TryParse(v, NumberStyles.Float, CultureInfo.InvariantCulture, out _));
                notes.Add($"column '{header[j]}' is not numeric (line {lines[bad]}: '{ValueParser.Shorten(column[bad])}') " +
                    "and not a chosen label column; ignored.");
            }
        }
        return new CellMetadata { Source = path, CellIdColumn = header[idColumn], CellIds = cells, Labels = labels, Recorded = recorded, Notes = notes };
    }

    private static bool IsNumeric(string[] column)
    {
        bool any = false;
        foreach (var v in column)
        {
            if (Missing.Contains(v.Trim())) continue;
            if (!double.TryParse(v, NumberStyles.Float, CultureInfo.InvariantCulture, out double d) || double.IsInfinity(d)) return false;
            any = true;
        }
        return any;
    }

    private static double? ParseOrNull(string v) =>
        Missing.Contains(v.Trim()) ? null : double.Parse(v, NumberStyles.Float, CultureInfo.InvariantCulture);
}
