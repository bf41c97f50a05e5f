using System.Text.RegularExpressions;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The files of one expression upload laid out for the library's reader in a private folder: one table as sent, or a
/// Matrix Market matrix with its sidecars (sent as several files or in one .zip / .tar.gz archive), sorted by
/// <see cref="MatrixMarketParts"/> and placed under the names the reader looks for (genes.tsv, barcodes.tsv beside the
/// matrix). <see cref="Translate"/> puts the user's own file names back into the reader's messages.
/// </summary>
public sealed class ExpressionParts
{
    /// <summary>What the reader opens: the table, or the matrix (its sidecars lie beside it).</summary>
    public required string TablePath { get; init; }
    /// <summary>How messages and built models name the table (the matrix's name for Matrix Market).</summary>
    public required string TableName { get; init; }
    /// <summary>The sorted Matrix Market files, or null for an ordinary table.</summary>
    public MatrixMarketParts? MatrixMarket { get; init; }
    private IReadOnlyDictionary<string, string> ReaderNames { get; init; } = new Dictionary<string, string>();

    /// <summary>Most files one upload may carry (before archives are opened).</summary>
    public const int MaxFiles = 8;

    /// <summary>Writes the upload into <paramref name="folder"/>, opening archives and sorting Matrix Market parts.</summary>
    /// <exception cref="UserInputException">An empty file, a bad archive, or Matrix Market parts that do not fit together.</exception>
    /// <exception cref="UploadTooLargeException">An archive or sidecar inflates past the limits.</exception>
    public static ExpressionParts Receive(IReadOnlyList<UploadedFile> upload, string folder, UploadLimits limits, CancellationToken cancel = default)
    {
        if (upload.Count == 0) throw new UserInputException("expression: no file was sent.");
        if (upload.Count > MaxFiles)
            throw new UserInputException($"expression: {upload.Count} files; at most {MaxFiles} (a matrix with its genes and barcodes files, or one archive).");
        var received = new List<ReceivedFile>();
        for (int i = 0; i < upload.Count; i++)
        {
            var file = upload[i];
            if (file.Bytes.Length == 0) throw new UserInputException($"{Path.GetFileName(file.Name)}: the file is empty (0 bytes).");
            var dir = Directory.CreateDirectory(Path.Combine(folder, "upload", (i + 1).ToString(System.Globalization.CultureInfo.InvariantCulture))).FullName;
            if (UploadArchive.Detect(file) != UploadArchive.Kind.None)
            {
                var entries = UploadArchive.Expand(file with { Name = Path.GetFileName(file.Name) }, dir, limits.MaxDecompressedBytes, cancel);
                if (entries.Count == 0) throw new UserInputException($"{Path.GetFileName(file.Name)}: the archive holds no files.");
                received.AddRange(entries);
                continue;
            }
            var path = Path.Combine(dir, ExpressionSession.SafeName(file.Name, "table.csv"));
            File.WriteAllBytes(path, file.Bytes);
            received.Add(new ReceivedFile(Path.GetFileName(file.Name), path));
        }
        var parts = MatrixMarketParts.Identify(received, limits, cancel);
        if (parts is null) return new ExpressionParts { TablePath = received[0].Path, TableName = received[0].Name };

        // The reader finds the sidecars by name beside the matrix; the matrix keeps its own name.
        var layout = Directory.CreateDirectory(Path.Combine(folder, "matrix-market")).FullName;
        var matrixName = ExpressionSession.SafeName(parts.Matrix.FileName, "matrix.mtx");
        if (matrixName is GenesName or CellsName) matrixName = "matrix.mtx";
        ReceivedFile Move(ReceivedFile file, string name)
        {
            File.Move(file.Path, Path.Combine(layout, name));
            return file with { Path = Path.Combine(layout, name) };
        }
        var placed = new MatrixMarketParts
        {
            Matrix = Move(parts.Matrix, matrixName),
            Genes = Move(parts.Genes, GenesName),
            Cells = Move(parts.Cells, CellsName),
            Rows = parts.Rows,
            Columns = parts.Columns,
            Entries = parts.Entries,
        };
        return new ExpressionParts
        {
            TablePath = placed.Matrix.Path,
            TableName = parts.Matrix.Name,
            MatrixMarket = placed,
            ReaderNames = new Dictionary<string, string>
            {
                [matrixName] = parts.Matrix.Name,
                [GenesName] = parts.Genes.Name,
                [CellsName] = parts.Cells.Name,
            },
        };
    }

    private const string GenesName = "genes.tsv";
    private const string CellsName = "barcodes.tsv";

    /// <summary>A reader's message with the files named as the user sent them.</summary>
    public string Translate(string message)
    {
        foreach (var (reader, user) in ReaderNames.Where(n => n.Key != n.Value).OrderByDescending(n => n.Key.Length))
            message = Regex.Replace(message, $@"(?<![\w./-]){Regex.Escape(reader)}(?![\w.-])", user.Replace("$", "$$"));
        return message;
    }
}
