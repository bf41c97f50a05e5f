using ExprModel.Core.Expression.Text;
using ExprModel.Core.Expression.Units;

namespace ExprModel.Core.Expression.Delimited;

/// <summary>
/// Reads a delimited text expression table (comma, tab or semicolon; RFC 4180 quoting; UTF-8 with or without BOM;
/// optionally gzip-compressed) in one streaming pass after a short probe, keeping only the genes the filter accepts
/// plus every cell's library size. Memory is bounded by the kept genes times cells plus one record.
/// </summary>
public static class DelimitedTableReader
{
    /// <summary>Rows read from the top of the file to decide the orientation.</summary>
    private const int ProbeRows = 200;

    /// <summary>What the probe of the file's top found: delimiter, identifiers of the header, orientation.</summary>
    private sealed record Shape(string File, bool Gzip, char Delimiter, string DelimiterName, List<string> Ids, int IdOffset,
        TableOrientation Orientation, string OrientationNote, List<string> Notes);

    public static ExpressionTable Read(string path, ExpressionReadOptions? options = null)
    {
        var o = options ?? ExpressionReadOptions.Default;
        var shape = Probe(path, o);
        var (file, delimiter, notes) = (shape.File, shape.Delimiter, shape.Notes);
        var stats = new ValueStats { WholeTolerance = o.LogTransform == LogTransform.None ? 0 : 1e-6, DecimalCommaAllowed = delimiter != ',' };
        using var records = OpenRecords(path, file, delimiter, o, o.Meter);
        records.ReadRecord(); // header, already parsed
        var result = shape.Orientation == TableOrientation.GenesAsRows
            ? ReadGenesAsRows(records, file, shape.Ids, shape.IdOffset, o, stats, notes)
            : ReadCellsAsRows(records, file, shape.Ids, shape.IdOffset, o, stats, notes);
        if (o.Cells is { } range)
            notes.Add($"read {range} of the file's cells (a part of the file); a unit not stated is decided from these cells' values.");

        if (stats.DecimalCommas > 0)
            notes.Add($"{stats.DecimalCommas} value(s) written with a decimal comma (first at {stats.FirstDecimalComma}) were read with the comma as the " +
                "decimal separator, as spreadsheets export them in decimal-comma locales.");
        var (unit, unitNote) = UnitDecision.Decide(file, o, stats, result.LibrarySizes, notes);
        return new ExpressionTable
        {
            Source = path,
            CellIds = result.Cells,
            Genes = result.Genes,
            LibrarySizes = result.LibrarySizes,
            TotalGeneCount = result.TotalGenes,
            Unit = unit,
            UnitNote = unitNote,
            Orientation = shape.Orientation,
            OrientationNote = shape.OrientationNote,
            FormatNote = $"{shape.DelimiterName}-delimited text{(shape.Gzip ? ", gzip-compressed" : "")} (delimiter detected from the header)",
            Notes = notes,
        };
    }

    /// <summary>How many cells the table holds: header fields when cells are columns, else its data rows (streamed past, not parsed).</summary>
    public static int CountCells(string path, ExpressionReadOptions? options = null)
    {
        var o = (options ?? ExpressionReadOptions.Default) with { Cells = null };
        var shape = Probe(path, o);
        if (shape.Orientation == TableOrientation.GenesAsRows) return shape.Ids.Count;
        using var records = OpenRecords(path, shape.File, shape.Delimiter, o);
        records.ReadRecord();
        int n = 0;
        while (records.SkipRecord()) n++;
        return n;
    }

    private static Shape Probe(string path, ExpressionReadOptions o)
    {
        string file = Path.GetFileName(path);
        bool gzip = InputFile.StartsWith(path, [0x1f, 0x8b]);
        var (delimiter, delimiterName) = DelimiterSniffer.Detect(path, file, o.MaxDecompressedBytes);

        // Probe: header and the first column of the first rows, to decide orientation.
        string corner;
        List<string> header;
        var firstColumn = new List<string>();
        int firstDataFieldCount = -1;
        using (var probe = OpenRecords(path, file, delimiter, o))
        {
            if (!probe.ReadRecord()) throw new ExpressionFormatException($"{file}: line 1: the file is empty.");
            corner = probe.FieldString(0);
            header = new List<string>(probe.FieldCount);
            for (int i = 0; i < probe.FieldCount; i++) header.Add(probe.FieldString(i));
            while (firstColumn.Count < ProbeRows && probe.ReadRecord())
            {
                if (firstDataFieldCount < 0) firstDataFieldCount = probe.FieldCount;
                firstColumn.Add(probe.FieldString(0));
            }
        }
        if (firstColumn.Count == 0)
            throw new ExpressionFormatException($"{file}: line 2: the file has a header but no data rows.");
        if (header.Count < 2 && firstDataFieldCount < 2)
            throw new ExpressionFormatException($"{file}: line 1: only one column; a table needs an identifier column and at least one value column.");

        // A header one field shorter than the data rows has no top-left cell (a common export style): every header
        // field is then an identifier. Not when the first header field is a corner label: that is a ragged row.
        bool noCorner = firstDataFieldCount == header.Count + 1 && !OrientationDetector.IsCornerLabel(header[0]);
        var notes = new List<string>();
        if (noCorner)
        {
            notes.Add("the header has one field fewer than the data rows: read it as having no top-left cell.");
            corner = "";
        }
        var ids = noCorner ? header : header.Skip(1).ToList();

        TableOrientation orientation;
        string orientationNote;
        if (o.Orientation is { } given)
            (orientation, orientationNote) =
                (given, given == TableOrientation.GenesAsRows ? "genes as rows (given by the user)" : "cells as rows (given by the user)");
        else
            (orientation, orientationNote) = OrientationDetector.Detect(file, corner, ids, firstColumn, o.KeepGene);
        return new Shape(file, gzip, delimiter, delimiterName, ids, noCorner ? 0 : 1, orientation, orientationNote, notes);
    }

    private sealed record Parsed(List<string> Cells, Dictionary<string, double[]> Genes, double[] LibrarySizes, int TotalGenes);

    private static RecordReader OpenRecords(string path, string file, char delimiter, ExpressionReadOptions o, ReadMeter? meter = null) =>
        new(InputFile.Open(path, o.MaxDecompressedBytes, meter), file, delimiter, o.MaxRecordChars, o.MaxColumns, o.MaxLines, o.Cancel);

    private static Parsed ReadGenesAsRows(RecordReader r, string file, List<string> cellIds, int offset, ExpressionReadOptions o, ValueStats stats,
        List<string> notes)
    {
        int total = cellIds.Count, expected = total + 1;
        var range = o.Cells ?? new CellRange(0, total);
        range.CheckWithin(total, file);
        var cells = new CellRegistry(file);
        for (int j = range.Start; j < range.End; j++) cells.Add(cellIds[j], $"line 1, column {j + 1 + offset}");
        int n = range.Count, first = range.Start;
        var library = new double[n];
        var genes = new Dictionary<string, double[]>(StringComparer.Ordinal);
        var registry = new GeneRegistry(file, o, notes);
        double[]? values = null;
        while (r.ReadRecord())
        {
            CheckFieldCount(r, expected);
            string gene = r.FieldString(0);
            bool keep = registry.Add(gene, $"line {r.LineNumber}, column 1");
            values ??= new double[n];
            for (int j = 0; j < n; j++)
            {
                double v = ParseValue(r, first + j + 1, o, stats, cellIds[first + j], gene);
                stats.Add(v);
                library[j] += v;
                values[j] = v;
            }
            o.Meter?.AddValues(n);
            if (keep) { genes.Add(gene, values); values = null; }
        }
        registry.Finish();
        return new Parsed(range.Count == total ? cellIds : cellIds.GetRange(first, n), genes, library, registry.Total);
    }

    private static Parsed ReadCellsAsRows(RecordReader r, string file, List<string> geneIds, int offset, ExpressionReadOptions o, ValueStats stats,
        List<string> notes)
    {
        var registry = new GeneRegistry(file, o, notes);
        var keptColumns = new List<int>();
        var keptNames = new List<string>();
        for (int j = 0; j < geneIds.Count; j++)
            if (registry.Add(geneIds[j], $"line 1, column {j + 1 + offset}")) { keptColumns.Add(j); keptNames.Add(geneIds[j]); }
        registry.Finish();
        var kept = keptNames.Select(_ => new List<double>()).ToArray();
        var cells = new CellRegistry(file);
        var cellIds = new List<string>();
        var library = new List<double>();
        int n = geneIds.Count, expected = n + 1;
        var isKept = new int[n];
        Array.Fill(isKept, -1);
        for (int k = 0; k < keptColumns.Count; k++) isKept[keptColumns[k]] = k;
        // With a range, other cells' rows are streamed past unparsed and reading stops after the range's last row.
        var range = o.Cells;
        int index = 0;
        while (true)
        {
            if (range is { } skip && index < skip.Start)
            {
                if (!r.SkipRecord()) break;
                index++;
                continue;
            }
            if (range is { } stop && index >= stop.End) break;
            if (!r.ReadRecord()) break;
            index++;
            CheckFieldCount(r, expected);
            string cell = r.FieldString(0);
            cells.Add(cell, $"line {r.LineNumber}, column 1");
            cellIds.Add(cell);
            double sum = 0;
            for (int j = 0; j < n; j++)
            {
                double v = ParseValue(r, j + 1, o, stats, cell, geneIds[j]);
                stats.Add(v);
                sum += v;
                if (isKept[j] >= 0) kept[isKept[j]].Add(v);
            }
            library.Add(sum);
            o.Meter?.AddValues(n);
        }
        range?.CheckWithin(index, file);
        var genes = new Dictionary<string, double[]>(StringComparer.Ordinal);
        for (int k = 0; k < keptNames.Count; k++) genes.Add(keptNames[k], kept[k].ToArray());
        return new Parsed(cellIds, genes, library.ToArray(), registry.Total);
    }

    private static void CheckFieldCount(RecordReader r, int expected)
    {
        if (r.FieldCount != expected)
            throw r.Error(Math.Min(r.FieldCount, expected) + 1,
                $"{r.FieldCount} fields where the header implies {expected} (ragged row{(r.FieldCount < expected ? ", values missing" : ", extra values")}).");
    }

    private static double ParseValue(RecordReader r, int column, ExpressionReadOptions o, ValueStats stats, string cell, string gene)
    {
        var problem = ValueParser.TryParse(r.Field(column), out double v, stats.DecimalCommaAllowed, out bool usedComma);
        if (problem is not null) throw r.Error(column + 1, $"cell '{cell}', gene '{gene}': {problem}.");
        if (usedComma && stats.DecimalCommas++ == 0) stats.FirstDecimalComma = $"line {r.LineNumber}, column {column + 1}";
        return o.LogTransform == LogTransform.None ? v : ValueParser.Undo(v, o.LogTransform);
    }
}
