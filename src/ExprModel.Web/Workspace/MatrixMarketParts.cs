using System.Globalization;
using System.IO.Compression;
using System.Text;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// Which uploaded file is the Matrix Market matrix and which are its sidecars (the genes or features file naming the
/// rows, the barcodes or cells file naming the columns), told apart by content and name: the matrix by its
/// "%%MatrixMarket" banner (gzip or not), a sidecar by its name (feature/gene, barcode/cell) or else by its line count
/// matching the matrix's rows or columns. A missing, extra or mismatched file is refused here, before any reading,
/// with both files named ("matrix.mtx has 2,000 rows but genes.tsv lists 1,998 genes").
/// </summary>
public sealed class MatrixMarketParts
{
    public required ReceivedFile Matrix { get; init; }
    public required ReceivedFile Genes { get; init; }
    public required ReceivedFile Cells { get; init; }
    /// <summary>The size line: rows (genes), columns (cells) and stored entries.</summary>
    public required long Rows { get; init; }
    public required long Columns { get; init; }
    public required long Entries { get; init; }

    /// <summary>One line for the Load page and notes.</summary>
    public string Summary =>
        $"Matrix Market matrix {Matrix.Name}: {Rows.ToString("N0", CultureInfo.InvariantCulture)} genes (named by {Genes.Name}) × "
        + $"{Columns.ToString("N0", CultureInfo.InvariantCulture)} cells (named by {Cells.Name}), "
        + $"{Entries.ToString("N0", CultureInfo.InvariantCulture)} stored values.";

    private const string Banner = "%%MatrixMarket";
    private const int HeadBytes = 64 * 1024;

    /// <summary>True when the file starts with the Matrix Market banner (after gzip, if gzip).</summary>
    public static bool IsMatrix(ReceivedFile file)
    {
        try { return Encoding.ASCII.GetString(Head(file, Banner.Length)) == Banner; }
        catch (UserInputException) { return false; } // damaged gzip: the table reader reports it with its location
    }

    /// <summary>
    /// Sorts the files of one upload. Null when none is a Matrix Market matrix and there is one file (an ordinary table).
    /// </summary>
    /// <exception cref="UserInputException">Several files and no matrix; two matrices; a missing, extra or mismatched sidecar.</exception>
    /// <exception cref="UploadTooLargeException">A sidecar inflates past the limits.</exception>
    public static MatrixMarketParts? Identify(IReadOnlyList<ReceivedFile> files, UploadLimits limits, CancellationToken cancel = default)
    {
        var matrices = files.Where(IsMatrix).ToList();
        if (matrices.Count == 0)
        {
            if (files.Count == 1) return null;
            throw new UserInputException($"{Names(files)}: {files.Count} files but none is a Matrix Market matrix (first line "
                + $"'{Banner} matrix coordinate ...'). Send one table, or one matrix with its genes and barcodes files.");
        }
        if (matrices.Count > 1)
            throw new UserInputException($"{Names(matrices)}: {matrices.Count} Matrix Market matrices in one upload; send one matrix with its "
                + "genes and barcodes files.");
        var matrix = matrices[0];
        var (rows, columns, entries) = SizeLine(matrix);
        string m = matrix.Name;

        var sidecars = files.Where(f => f != matrix).Select(f => (File: f, Lines: CountLines(f, limits, cancel), Role: RoleByName(f))).ToList();
        var genes = sidecars.Where(s => s.Role == Role.Genes).ToList();
        var cells = sidecars.Where(s => s.Role == Role.Cells).ToList();
        if (genes.Count > 1) throw new UserInputException($"{Names(genes.Select(g => g.File))}: two files name the genes of {m}; send one.");
        if (cells.Count > 1) throw new UserInputException($"{Names(cells.Select(c => c.File))}: two files name the cells of {m}; send one.");
        // Files whose names say nothing take the role their line count fits.
        foreach (var s in sidecars.Where(s => s.Role == Role.Unknown).ToList())
        {
            bool fitsRows = s.Lines == rows && genes.Count == 0, fitsColumns = s.Lines == columns && cells.Count == 0;
            if (fitsRows && fitsColumns)
                throw new UserInputException($"{s.File.Name}: its {s.Lines:N0} lines fit both the rows and the columns of {m}; name it "
                    + "genes.tsv (or features.tsv) or barcodes.tsv so it is clear which it is.");
            if (fitsRows) genes.Add(s);
            else if (fitsColumns) cells.Add(s);
            else
                throw new UserInputException($"{s.File.Name}: {s.Lines:N0} lines, which match neither the {rows:N0} rows (genes) nor the "
                    + $"{columns:N0} columns (cells) of {m}; it is not one of its sidecar files.");
        }
        if (genes.Count == 0)
            throw new UserInputException($"{m} came without its genes file: add the features.tsv or genes.tsv that names its {rows:N0} rows "
                + "(one gene per line).");
        if (cells.Count == 0)
            throw new UserInputException($"{m} came without its cells file: add the barcodes.tsv that names its {columns:N0} columns "
                + "(one cell per line).");
        if (genes[0].Lines != rows)
            throw new UserInputException($"{m} has {rows:N0} rows but {genes[0].File.Name} lists {genes[0].Lines:N0} genes.");
        if (cells[0].Lines != columns)
            throw new UserInputException($"{m} has {columns:N0} columns but {cells[0].File.Name} lists {cells[0].Lines:N0} cells.");
        return new MatrixMarketParts
        {
            Matrix = matrix,
            Genes = genes[0].File,
            Cells = cells[0].File,
            Rows = rows,
            Columns = columns,
            Entries = entries,
        };
    }

    private enum Role { Unknown, Genes, Cells }

    private static Role RoleByName(ReceivedFile f)
    {
        var name = f.FileName.ToLowerInvariant();
        bool genes = name.Contains("feature") || name.Contains("gene"), cells = name.Contains("barcode") || name.Contains("cell");
        return genes == cells ? Role.Unknown : genes ? Role.Genes : Role.Cells;
    }

    private static string Names(IEnumerable<ReceivedFile> files) => string.Join(", ", files.Select(f => f.Name));

    /// <summary>The size line "rows columns entries" after the banner and comment lines.</summary>
    private static (long Rows, long Columns, long Entries) SizeLine(ReceivedFile matrix)
    {
        var lines = Encoding.UTF8.GetString(Head(matrix, HeadBytes)).Split('\n');
        for (int i = 1; i < lines.Length - 1; i++)
        {
            var line = lines[i].Trim();
            if (line.Length == 0 || line.StartsWith('%')) continue;
            var f = line.Split([' ', '\t'], StringSplitOptions.RemoveEmptyEntries);
            if (f.Length == 3 && long.TryParse(f[0], NumberStyles.None, CultureInfo.InvariantCulture, out long r)
                && long.TryParse(f[1], NumberStyles.None, CultureInfo.InvariantCulture, out long c)
                && long.TryParse(f[2], NumberStyles.None, CultureInfo.InvariantCulture, out long e))
                return (r, c, e);
            throw new UserInputException($"{matrix.Name}: line {i + 1}: the size line must be 'rows columns entries' (three whole numbers), "
                + $"found '{(line.Length > 60 ? line[..60] + "…" : line)}'.");
        }
        throw new UserInputException($"{matrix.Name}: no size line 'rows columns entries' in its first {HeadBytes / 1024} KB.");
    }

    /// <summary>Non-blank lines (the readers skip blank ones), inflating gzip within the upload limits.</summary>
    private static long CountLines(ReceivedFile file, UploadLimits limits, CancellationToken cancel)
    {
        if (Head(file, HeadBytes).Contains((byte)0))
            throw new UserInputException($"{file.Name}: holds NUL bytes; not a text file (a genes, features or barcodes list, optionally gzip).");
        using var s = Open(file);
        var buffer = new byte[1 << 16];
        long lines = 0, physical = 0, total = 0;
        bool blank = true;
        int n;
        while ((n = Read(s, file, buffer)) > 0)
        {
            cancel.ThrowIfCancellationRequested();
            total += n;
            if (total > limits.MaxDecompressedBytes)
                throw new UploadTooLargeException($"{file.Name}: inflates past this server's limit of {limits.MaxDecompressedBytes / (1024.0 * 1024.0):0.##} "
                    + $"MB ({WebOptions.Section}:MaxDecompressedMegabytes).");
            foreach (byte b in buffer.AsSpan(0, n))
            {
                if (b == (byte)'\n')
                {
                    if (!blank) lines++;
                    if (++physical > limits.MaxLines)
                        throw new UploadTooLargeException($"{file.Name}: more than {limits.MaxLines:N0} lines ({WebOptions.Section}:MaxTableLines).");
                    blank = true;
                }
                else if (b is not ((byte)' ' or (byte)'\t' or (byte)'\r')) blank = false;
            }
        }
        return blank ? lines : lines + 1;
    }

    private static byte[] Head(ReceivedFile file, int count)
    {
        using var s = Open(file);
        var head = new byte[count];
        int n = 0, r;
        while (n < count && (r = Read(s, file, head.AsSpan(n))) > 0) n += r;
        return head[..n];
    }

    private static Stream Open(ReceivedFile file)
    {
        var raw = new FileStream(file.Path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16);
        Span<byte> magic = stackalloc byte[2];
        int n = raw.ReadAtLeast(magic, 2, throwOnEndOfStream: false);
        raw.Position = 0;
        return n == 2 && magic[0] == 0x1f && magic[1] == 0x8b ? new GZipStream(raw, CompressionMode.Decompress) : raw;
    }

    private static int Read(Stream s, ReceivedFile file, Span<byte> buffer)
    {
        try { return s.Read(buffer); }
        catch (InvalidDataException) { throw new UserInputException($"{file.Name}: the gzip data is damaged or truncated."); }
    }
}
