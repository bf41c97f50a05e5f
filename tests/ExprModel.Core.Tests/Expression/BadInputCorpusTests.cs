using System.IO.Compression;
using System.Text;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.AnnData;
using ExprModel.Core.Expression.Metadata;
using PureHDF;
using ExprModel.Core.Tests.Expression.AnnData;
using Xunit.Abstractions;

namespace ExprModel.Core.Tests.Expression;

/// <summary>
/// Every bad input must fail with <see cref="ExpressionFormatException"/> whose message names the file, the place
/// (line and column, or the HDF5 dataset path) and the problem: never another exception, a hang, or unbounded memory.
/// Small cases are committed under tests/data/expression/bad/; big or binary ones are made here at test time.
/// </summary>
public sealed class BadInputCorpusTests(ITestOutputHelper output) : IDisposable
{
    private static readonly string CorpusDir = Path.Combine(AppContext.BaseDirectory, "data", "expression", "bad");
    private readonly TempFiles _files = new();
    public void Dispose() => _files.Dispose();

    /// <summary>How to read a case: as an expression table, as cell metadata, or as h5ad through the AnnData reader.</summary>
    public enum Reader { Expression, Metadata, AnnData }

    /// <summary>Case name (file or directory under bad/, or a generated name), reader, file named in the message, expected place, expected problem
    /// words.</summary>
    public static TheoryData<string, Reader, string, string, string> Committed => new()
    {
        { "empty.csv", Reader.Expression, "empty.csv", "line 1", "empty" },
        { "header_only.csv", Reader.Expression, "header_only.csv", "line 2", "no data rows" },
        { "blank_lines_only.csv", Reader.Expression, "blank_lines_only.csv", "line 1", "no comma, tab or semicolon" },
        { "ragged_short_row.csv", Reader.Expression, "ragged_short_row.csv", "line 3, column 4", "ragged" },
        { "ragged_long_row.csv", Reader.Expression, "ragged_long_row.csv", "line 2, column 4", "ragged" },
        { "ragged_cells_as_rows.csv", Reader.Expression, "ragged_cells_as_rows.csv", "line 3, column 4", "ragged" },
        { "non_numeric_value.csv", Reader.Expression, "non_numeric_value.csv", "line 2, column 3", "not a number" },
        { "mixed_separators.csv", Reader.Expression, "mixed_separators.csv", "line 2, column 3", "mixes thousands and decimal separators" },
        { "decimal_comma_in_comma_table.csv", Reader.Expression, "decimal_comma_in_comma_table.csv", "line 2, column 3", "not a number" },
        { "negative_value.csv", Reader.Expression, "negative_value.csv", "line 3, column 2", "negative" },
        { "nan_value.csv", Reader.Expression, "nan_value.csv", "line 2, column 3", "NaN" },
        { "infinite_value.csv", Reader.Expression, "infinite_value.csv", "line 3, column 2", "infinite" },
        { "overflow_value.csv", Reader.Expression, "overflow_value.csv", "line 2, column 3", "infinite" },
        { "empty_value.csv", Reader.Expression, "empty_value.csv", "line 2, column 3", "empty value" },
        { "na_value.tsv", Reader.Expression, "na_value.tsv", "line 2, column 2", "not a number" },
        { "duplicate_genes.csv", Reader.Expression, "duplicate_genes.csv", "line 4, column 1", "duplicated" },
        { "duplicate_genes_as_columns.csv", Reader.Expression, "duplicate_genes_as_columns.csv", "line 1, column 4", "duplicated" },
        { "duplicate_cells.csv", Reader.Expression, "duplicate_cells.csv", "line 1, column 4", "duplicated" },
        { "duplicate_cells_as_rows.csv", Reader.Expression, "duplicate_cells_as_rows.csv", "line 4, column 1", "duplicated" },
        { "empty_gene_id.csv", Reader.Expression, "empty_gene_id.csv", "line 3, column 1", "empty gene identifier" },
        { "empty_cell_id.csv", Reader.Expression, "empty_cell_id.csv", "line 1, column 3", "empty cell identifier" },
        { "pipe_delimiter.csv", Reader.Expression, "pipe_delimiter.csv", "line 1", "no comma, tab or semicolon" },
        { "space_delimiter.txt", Reader.Expression, "space_delimiter.txt", "line 1", "no comma, tab or semicolon" },
        { "single_column.csv", Reader.Expression, "single_column.csv", "line 1", "no comma, tab or semicolon" },
        { "unterminated_quote.csv", Reader.Expression, "unterminated_quote.csv", "line 2, column 1", "never closed" },
        { "quote_inside_field.csv", Reader.Expression, "quote_inside_field.csv", "line 2, character 8", "quote inside an unquoted field" },
        { "text_after_closing_quote.csv", Reader.Expression, "text_after_closing_quote.csv", "line 2, character 8", "after a closing quote" },
        { "nul_character.csv", Reader.Expression, "nul_character.csv", "line 2, character 9", "NUL" },
        { "invalid_utf8.csv", Reader.Expression, "invalid_utf8.csv", "line 2, character 4", "byte 0xE9 (column 1) is not UTF-8" },
        { "utf16_without_bom.csv", Reader.Expression, "utf16_without_bom.csv", "line 1, character 2", "NUL" },
        { "orientation_unclear.csv", Reader.Expression, "orientation_unclear.csv", "line 1, column 1", "rows or columns" },
        { "mtx_row_out_of_range", Reader.Expression, "matrix.mtx", "line 4, column 1", "outside 1..3" },
        { "mtx_column_out_of_range", Reader.Expression, "matrix.mtx", "line 4, column 2", "outside 1..2" },
        { "mtx_zero_index", Reader.Expression, "matrix.mtx", "line 3, column 1", "outside" },
        { "mtx_features_mismatch", Reader.Expression, "matrix.mtx", "line 2, column 1", "mismatched sidecar" },
        { "mtx_barcodes_mismatch", Reader.Expression, "matrix.mtx", "line 2, column 2", "mismatched sidecar" },
        { "mtx_array_format", Reader.Expression, "matrix.mtx", "line 1", "coordinate" },
        { "mtx_symmetric", Reader.Expression, "matrix.mtx", "line 1", "symmetry" },
        { "mtx_fewer_entries", Reader.Expression, "matrix.mtx", "line 5", "truncated" },
        { "mtx_more_entries", Reader.Expression, "matrix.mtx", "line 4, column 1", "more entries" },
        { "mtx_negative_value", Reader.Expression, "matrix.mtx", "line 4, column 3", "negative" },
        { "mtx_bad_size_line", Reader.Expression, "matrix.mtx", "line 2, column 2", "not a whole number" },
        { "mtx_short_entry", Reader.Expression, "matrix.mtx", "line 4, column 3", "row column value" },
        { "mtx_duplicate_entry", Reader.Expression, "matrix.mtx", "line 5, column 1", "appears a second time" },
        { "mtx_duplicate_barcodes", Reader.Expression, "barcodes.tsv", "line 2, column 1", "duplicated" },
        { "mtx_ragged_features", Reader.Expression, "features.tsv", "line 2, column 3", "ragged" },
        { "metadata_ragged.csv", Reader.Metadata, "metadata_ragged.csv", "line 3, column 3", "ragged" },
        { "metadata_duplicate_cells.csv", Reader.Metadata, "metadata_duplicate_cells.csv", "line 4, column 1", "duplicated" },
        { "metadata_duplicate_header.csv", Reader.Metadata, "metadata_duplicate_header.csv", "line 1, column 3", "appears twice" },
        { "metadata_header_only.csv", Reader.Metadata, "metadata_header_only.csv", "line 2", "no rows" },
    };

    [Theory]
    [MemberData(nameof(Committed))]
    public void CommittedBadFile_FailsWithLocatedMessage(string name, Reader reader, string file, string place, string problem) =>
        AssertLocatedFailure(Path.Combine(CorpusDir, name), reader, file, place, problem);

    [Fact]
    public void CorpusHasAtLeastThirtyCommittedCasesAndAllAreListed()
    {
        var onDisk = Directory.EnumerateFileSystemEntries(CorpusDir).Select(p => Path.GetFileName(p)!).Order().ToList();
        var listed = Committed.Select(row => (string)row[0]).Order().ToList();
        Assert.True(onDisk.Count >= 30, $"only {onDisk.Count} committed bad cases");
        Assert.Equal(onDisk, listed);
    }

    public static TheoryData<string> Generated => new(GeneratedCases.Keys);

    [Theory]
    [MemberData(nameof(Generated))]
    public void GeneratedBadFile_FailsWithLocatedMessage(string name)
    {
        var (make, reader, place, problem) = GeneratedCases[name];
        var path = make(_files, name);
        AssertLocatedFailure(path, reader, Path.GetFileName(path), place, problem);
    }

    private delegate string Maker(TempFiles files, string name);

    private static readonly Dictionary<string, (Maker Make, Reader Reader, string Place, string Problem)> GeneratedCases = new()
    {
        // A bad byte on line 3, and one far past the decoder's first 64 K block: the message names its own line and character.
        ["invalid_utf8_line3.csv"] = ((f, n) => f.Bytes(n, [.. "gene,c1,c2\nScn1a,1,2\nKcnc1,3,"u8, 0xFF, .. "4\n"u8]), Reader.Expression,
            "line 3, character 9", "byte 0xFF (column 3) is not UTF-8"),
        ["invalid_utf8_late.csv.gz"] = ((f, n) => f.Bytes(n, TempFiles.Gzip([.. Encoding.UTF8.GetBytes(SmallTable(20_000)), .. "G\u00e9x,"u8, 0xC3, 0x28,
            .. ",1,1\n"u8])), Reader.Expression, "line 20002, character 5", "byte 0xC3 (column 2)"),
        // After a byte-order mark (which a reader must not answer by switching to a decoder that replaces bad bytes).
        ["invalid_utf8_after_bom.csv"] = ((f, n) => f.Bytes(n, [0xEF, 0xBB, 0xBF, .. "gene,c1\nScn1a,"u8, 0x80, .. "\n"u8]), Reader.Expression,
            "line 2, character 7", "byte 0x80"),
        ["binary_garbage.csv"] = ((f, n) => f.Bytes(n, RandomBytes(1 << 16, seed: 1)), Reader.Expression, "line 1", ""),
        // 1,000 gzip members of 1 MB of '0' each: about 1 MB on disk, 1 GB inflated, with no line break at all. The
        // record-length limit stops it after 32 M characters.
        ["gzip_bomb.csv.gz"] = ((f, n) => f.Bytes(n, Bomb(1000)), Reader.Expression, "line 2", "record longer than"),
        ["truncated.csv.gz"] = ((f, n) => f.Bytes(n, Truncate(TempFiles.Gzip(Encoding.UTF8.GetBytes(SmallTable(2000))), keep: 0.5)), Reader.Expression,
            "decompressed data", "truncated"),
        // Cut exactly after a line: without the trailer check this reads as a valid, shorter table.
        ["truncated_at_line_end.csv.gz"] = ((f, n) => f.Bytes(n, TruncateAtLineEnd(SmallTable(2000))), Reader.Expression, "decompressed data", "truncated"),
        ["corrupt_gzip.csv.gz"] =
            ((f, n) => f.Bytes(n, CorruptMiddle(TempFiles.Gzip(Encoding.UTF8.GetBytes(SmallTable(2000))))), Reader.Expression, "decompressed data", "corrupt"),
        ["million_columns.csv"] = ((f, n) => f.Text(n, "gene," + string.Join(",", Enumerable.Range(0, 1_000_000).Select(i => $"c{i}")) + "\nScn1a,1\n"),
            Reader.Expression, "line 1, column 500001", "more than 500,000 columns"),
        ["endless_line.csv"] = ((f, n) => f.Text(n, "gene,c1\nScn1a," + new string('7', 40 << 20) + "\n"), Reader.Expression, "line 2", "record longer than"),
        ["no_x.h5ad"] = ((f, n) => H5ad(f, n, x: null), Reader.AnnData, "dataset /X", "missing"),
        ["x_wrong_shape.h5ad"] = ((f, n) => H5ad(f, n, x: new float[3, 3]), Reader.AnnData, "dataset /X", "shape"),
        ["x_negative.h5ad"] = ((f, n) => H5ad(f, n, x: new float[,] { { 1, 2, 3, 4 }, { 0, 0, -1, 0 }, { 1, 1, 1, 1 } }), Reader.AnnData,
            "dataset /X: row 1, column 2", "negative"),
        ["x_nan.h5ad"] = ((f, n) => H5ad(f, n, x: new double[,] { { 1, 2, 3, 4 }, { 0, 0, 1, 0 }, { 1, double.NaN, 1, 1 } }), Reader.AnnData,
            "dataset /X: row 2, column 1", "NaN"),
        ["csr_index_out_of_range.h5ad"] =
            ((f, n) => H5ad(f, n, x: Csr(indices: [0, 2, 9, 0, 1, 3, 2, 3])), Reader.AnnData, "dataset /X/indices: element 2", "outside 0..3"),
        ["csr_indptr_decreasing.h5ad"] = ((f, n) => H5ad(f, n, x: Csr(indptr: [0, 6, 3, 8])), Reader.AnnData, "dataset /X/indptr", "decreases"),
        ["csr_data_too_short.h5ad"] = ((f, n) => H5ad(f, n, x: Csr(data: [5, 2, 10])), Reader.AnnData, "dataset /X/data", "shape"),
        ["csr_missing_indices.h5ad"] = ((f, n) => H5ad(f, n, x: Csr(dropIndices: true)), Reader.AnnData, "dataset /X/indices", "missing"),
        ["x_unknown_encoding.h5ad"] = ((f, n) => H5ad(f, n, x: new H5Group
        {
            ["data"] = new float[] { 1 },
            Attributes = new() { ["encoding-type"] = "coo_matrix" }
        }), Reader.AnnData, "dataset /X", "coo_matrix"),
        ["old_layout_obs.h5ad"] = ((f, n) => OldLayout(f, n), Reader.AnnData, "dataset /obs", "older AnnData layout"),
        ["no_var.h5ad"] = ((f, n) => H5ad(f, n, x: AnnDataReaderTests.Dense, withVar: false), Reader.AnnData, "dataset /var", "missing"),
        ["duplicate_obs.h5ad"] =
            ((f, n) => H5ad(f, n, x: AnnDataReaderTests.Dense, cells: ["c1", "c2", "c1"]), Reader.AnnData, "dataset /obs index, row 2", "duplicated"),
        ["not_hdf5.h5ad"] = ((f, n) => f.Text(n, "gene,c1\nScn1a,1\n"), Reader.AnnData, "byte 0", "not an HDF5 file"),
        ["truncated_hdf5.h5ad"] = ((f, n) => TruncateFile(H5ad(f, n, x: AnnDataReaderTests.Dense), keep: 0.4), Reader.AnnData, "dataset /", ""),
    };

    /// <summary>A valid two-line table followed by <paramref name="megabytes"/> MB of blank lines, as concatenated gzip members (small on disk).</summary>
    private static byte[] BlankLineBomb(int megabytes)
    {
        var head = TempFiles.Gzip(Encoding.UTF8.GetBytes("gene,c1\nScn1a,1\n"));
        var member = TempFiles.Gzip(Enumerable.Repeat((byte)'\n', 1 << 20).ToArray());
        return [.. head, .. Enumerable.Range(0, megabytes).SelectMany(_ => member)];
    }

    [Fact]
    public void BlankLinesPastTheLineLimit_StopWithTheLimitNamed()
    {
        var path = _files.Bytes("blank_lines.csv.gz", BlankLineBomb(64));
        var e = Assert.Throws<ExpressionLimitException>(() => ExpressionReader.Read(path, new ExpressionReadOptions { MaxLines = 100_000 }));
        Assert.Contains("blank_lines.csv.gz: line 100,001: more than 100,000 lines", e.Message);
    }

    [Fact]
    public void InflatingPastTheByteLimit_StopsWithTheLimitNamed()
    {
        var path = _files.Bytes("inflates.csv.gz", BlankLineBomb(8));
        var e = Assert.Throws<ExpressionLimitException>(() =>
            ExpressionReader.Read(path, new ExpressionReadOptions { MaxDecompressedBytes = 1_000_000 }));
        Assert.Contains("inflates.csv.gz", e.Message);
        Assert.Contains("past the limit of 1,000,000 bytes", e.Message);
    }

    [Fact]
    public void ACancelledRead_Stops()
    {
        // 2 GB of blank lines: read to the end this returns a one-gene table, so only cancellation can make it throw.
        var path = _files.Bytes("endless_blank_lines.csv.gz", BlankLineBomb(2048));
        using var cancel = new CancellationTokenSource(TimeSpan.FromMilliseconds(300));
        var task = Task.Run(() => ExpressionReader.Read(path, new ExpressionReadOptions { Cancel = cancel.Token }));
        Assert.True(((IAsyncResult)task).AsyncWaitHandle.WaitOne(TimeSpan.FromMinutes(2)), "reader did not finish");
        Assert.IsAssignableFrom<OperationCanceledException>(task.Exception?.InnerException);
    }

    private void AssertLocatedFailure(string path, Reader reader, string file, string place, string problem)
    {
        long before = GC.GetTotalAllocatedBytes(precise: false);
        Action read = reader switch
        {
            Reader.Expression => () => ExpressionReader.Read(path),
            Reader.Metadata => () => CellMetadataReader.Read(path),
            _ => () => AnnDataReader.Read(path),
        };
        // A hang is a failure too: give each case a generous bound (a wall-clock guard, not a performance check).
        var task = Task.Run(read);
        bool finished;
        try { finished = task.Wait(TimeSpan.FromMinutes(2)); }
        catch (AggregateException) { finished = true; }
        Assert.True(finished, $"{file}: reader did not finish");
        var inner = task.Exception?.InnerException;
        Assert.NotNull(inner);
        var e = Assert.IsAssignableFrom<ExpressionFormatException>(inner);
        output.WriteLine($"{Path.GetFileName(path)}: {e.Message} (allocated {(GC.GetTotalAllocatedBytes() - before) >> 20} MB)");
        Assert.Contains(file, e.Message);
        Assert.Contains(place, e.Message);
        Assert.Contains(problem, e.Message);
    }

    private static string SmallTable(int genes)
    {
        var sb = new StringBuilder("gene,c1,c2,c3\n");
        for (int g = 0; g < genes; g++) sb.Append($"G{g},{g % 7},{g % 5},{g % 3}\n");
        return sb.ToString();
    }

    private static byte[] RandomBytes(int n, int seed)
    {
        var b = new byte[n];
        new Random(seed).NextBytes(b);
        b[0] = 0xC3; b[1] = 0x28; // an invalid UTF-8 pair up front, so the garbage is not mistaken for text
        return b;
    }

    private static byte[] Bomb(int members)
    {
        // A valid header and the start of a row, then the zeros (RFC 1952 allows concatenated members).
        var head = TempFiles.Gzip(Encoding.UTF8.GetBytes("gene,c1\nScn1a,"));
        var member = TempFiles.Gzip(Enumerable.Repeat((byte)'0', 1 << 20).ToArray());
        var all = new byte[head.Length + member.Length * members];
        head.CopyTo(all, 0);
        for (int i = 0; i < members; i++) member.CopyTo(all, head.Length + i * member.Length);
        return all;
    }

    /// <summary>The gzip of a prefix of the table ending at a line break, with its trailer removed.</summary>
    private static byte[] TruncateAtLineEnd(string table)
    {
        var prefix = table[..(table.IndexOf('\n', table.Length / 2) + 1)];
        var gz = TempFiles.Gzip(Encoding.UTF8.GetBytes(prefix));
        return gz[..^8];
    }

    private static byte[] Truncate(byte[] data, double keep) => data[..(int)(data.Length * keep)];

    private static byte[] CorruptMiddle(byte[] data)
    {
        var copy = (byte[])data.Clone();
        for (int i = copy.Length / 2; i < copy.Length / 2 + 64; i++) copy[i] = 0xFF;
        return copy;
    }

    private static string TruncateFile(string path, double keep)
    {
        var bytes = File.ReadAllBytes(path);
        File.WriteAllBytes(path, bytes[..(int)(bytes.Length * keep)]);
        return path;
    }

    /// <summary>obs written as one dataset rather than a group, as older writers did with compound data frames.</summary>
    private static string OldLayout(TempFiles f, string name)
    {
        var path = Path.Combine(f.Dir, name);
        new H5File
        {
            ["obs"] = new int[] { 1, 2, 3 },
            ["var"] = AnnDataReaderTests.Frame(AnnDataReaderTests.Genes),
            ["X"] = AnnDataReaderTests.Dense
        }.Write(path);
        return path;
    }

    private static H5Group Csr(float[]? data = null, int[]? indices = null, long[]? indptr = null, bool dropIndices = false)
    {
        var g = AnnDataReaderTests.Csr();
        if (data is not null) g["data"] = data;
        if (indices is not null) g["indices"] = indices;
        if (indptr is not null) g["indptr"] = indptr;
        if (dropIndices) g.Remove("indices");
        return g;
    }

    private static string H5ad(TempFiles f, string name, object? x, bool withVar = true, string[]? cells = null)
    {
        var path = Path.Combine(f.Dir, name);
        var file = new H5File { ["obs"] = AnnDataReaderTests.Frame(cells ?? AnnDataReaderTests.Cells) };
        if (withVar) file["var"] = AnnDataReaderTests.Frame(AnnDataReaderTests.Genes);
        if (x is not null) file["X"] = x;
        file.Write(path);
        return path;
    }
}
