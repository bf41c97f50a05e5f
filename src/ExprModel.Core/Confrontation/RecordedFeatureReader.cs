using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;
using ExprModel.Core.Expression.Text;

namespace ExprModel.Core.Confrontation;

/// <summary>
/// Reads a per-cell table of recorded values (the cell metadata table or a separate file; comma, tab or semicolon
/// delimited, optionally gzip) with the library's one delimited-record reader. Cell ids are found as the metadata reader
/// finds them; values stay text until <see cref="ReadoutMatcher"/> has decided which columns are read-outs.
/// </summary>
public static class RecordedFeatureReader
{
    public const long MaxDecompressedBytes = 1L << 30;

    /// <param name="cellIdColumn">Header of the cell id column; null picks one named like a cell id, else the first.</param>
    /// <param name="sourceName">The name messages use (default: the file name of <paramref name="path"/>).</param>
    /// <exception cref="ExpressionFormatException">The file cannot be read as a table (file, line and column named).</exception>
    public static RecordedFeatureTable Read(string path, string? cellIdColumn = null, string? sourceName = null)
    {
        string file = sourceName ?? Path.GetFileName(path);
        var (delimiter, _) = DelimiterSniffer.Detect(path, file, MaxDecompressedBytes);
        using var r = new RecordReader(InputFile.Open(path, MaxDecompressedBytes), file, delimiter, 1 << 20, 10_000);
        if (!r.ReadRecord()) throw new ExpressionFormatException($"{file}: line 1: the file is empty.");
        var header = Enumerable.Range(0, r.FieldCount).Select(r.FieldString).ToList();
        for (int j = 0; j < header.Count; j++)
        {
            int k = header.FindIndex(h => h == header[j]);
            if (k != j && header[j].Length > 0) throw r.Error(j + 1, $"column '{header[j]}' appears twice (also column {k + 1}).");
        }
        int id;
        var notes = new List<string>();
        if (cellIdColumn is not null)
        {
            id = header.IndexOf(cellIdColumn);
            if (id < 0) throw new ExpressionFormatException($"{file}: line 1: no column '{cellIdColumn}' for cell ids (have: {string.Join(", ", header)}).");
        }
        else
        {
            id = header.FindIndex(h => CellMetadataReader.CellIdHeader().IsMatch(h.Trim()));
            if (id < 0) { id = 0; notes.Add($"{file}: no column is named like a cell id; took the first column '{header[0]}'."); }
        }
        var rows = new List<string[]>();
        var lines = new List<long>();
        var ids = new List<string>();
        var seen = new Dictionary<string, long>(StringComparer.Ordinal);
        while (r.ReadRecord())
        {
            if (r.FieldCount != header.Count)
                throw r.Error(Math.Min(r.FieldCount, header.Count) + 1, $"{r.FieldCount} fields where the header has {header.Count} (ragged row).");
            var fields = Enumerable.Range(0, r.FieldCount).Select(r.FieldString).ToArray();
            string cell = fields[id].Trim();
            if (cell.Length == 0) throw r.Error(id + 1, "empty cell id.");
            if (seen.TryGetValue(cell, out long first)) throw r.Error(id + 1, $"cell '{cell}' appears twice (also line {first}).");
            seen[cell] = r.LineNumber;
            rows.Add(fields);
            lines.Add(r.LineNumber);
            ids.Add(cell);
        }
        if (rows.Count == 0) throw new ExpressionFormatException($"{file}: line 2: the file has a header but no rows.");
        return new RecordedFeatureTable
        {
            Source = file,
            CellIdColumn = header[id],
            CellIdColumnNumber = id + 1,
            Headers = header,
            CellIds = ids,
            Lines = lines,
            Rows = rows,
            Notes = notes,
        };
    }
}
