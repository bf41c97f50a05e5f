using ExprModel.Core.Expression;
using ExprModel.Core.Expression.AnnData;
using ExprModel.Web.Hosting;

namespace ExprModel.Web.Workspace;

/// <summary>
/// What the Load page shows of an upload before it is read for real: the first lines of the table (or of the Matrix
/// Market matrix), and for Matrix Market which file was taken for which part. Archives are opened and the parts sorted
/// in a private folder deleted at once, so a bad archive or a missing sidecar is reported on upload. An AnnData .h5ad
/// file is described instead (<see cref="AnnDataReader.Describe"/>): one line per matrix a user can pick, and
/// <see cref="AnnData"/> for the page's matrix choice and its log-transform hint.
/// </summary>
/// <param name="AnnData">The file's matrices when the upload is one .h5ad file; null otherwise.</param>
public sealed record UploadPreview(IReadOnlyList<string> Lines, string? Summary, AnnDataOverview? AnnData = null)
{
    /// <exception cref="Simulation.UserInputException">The upload cannot be used (named file and reason).</exception>
    /// <exception cref="UploadTooLargeException">An archive or sidecar inflates past the limits.</exception>
    public static UploadPreview Of(IReadOnlyList<UploadedFile> files, UploadLimits limits, CancellationToken cancel = default)
    {
        if (files.Count == 1 && IsAnnData(files[0])) return DescribeAnnData(files[0]);
        if (files.Count == 1 && UploadArchive.Detect(files[0]) == UploadArchive.Kind.None && !LooksLikeMatrix(files[0]))
            return new UploadPreview(TablePreview.FirstLines(files[0].Bytes, files[0].Name), null);
        var dir = Path.Combine(Path.GetTempPath(), "exprmodel-preview-" + Guid.NewGuid().ToString("N"));
        try
        {
            var parts = ExpressionParts.Receive(files, dir, limits, cancel);
            if (parts.MatrixMarket is { } m) return new UploadPreview(MatrixEntries(m), m.Summary);
            var table = new ReceivedFile(parts.TableName, parts.TablePath);
            return new UploadPreview(TablePreview.FirstLines(table), $"{parts.TableName}: the table taken from the archive.");
        }
        finally
        {
            try { Directory.Delete(dir, recursive: true); } catch (IOException) { }
        }
    }

    /// <summary>An HDF5 file (by its signature), or a file named .h5ad (so one without the signature is refused as such, by name).</summary>
    public static bool IsAnnData(UploadedFile file) =>
        file.Bytes.AsSpan().StartsWith(Hdf5Signature) || file.Name.EndsWith(".h5ad", StringComparison.OrdinalIgnoreCase);

    /// <summary>HDF5 file signature (HDF5 file format specification, superblock).</summary>
    private static ReadOnlySpan<byte> Hdf5Signature => [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a];

    /// <summary>The file's matrices, one preview line each; the library reads from a file, so the bytes go to a private folder first.</summary>
    private static UploadPreview DescribeAnnData(UploadedFile file)
    {
        var dir = Directory.CreateTempSubdirectory("exprmodel-preview-").FullName;
        try
        {
            var path = Path.Combine(dir, ExpressionSession.SafeName(file.Name, "table.h5ad"));
            File.WriteAllBytes(path, file.Bytes);
            AnnDataOverview overview;
            try { overview = AnnDataReader.Describe(path); }
            catch (ExpressionFormatException e) { throw new Simulation.UserInputException(RenameFile(e.Message, Path.GetFileName(path), file.Name)); }
            var lines = new List<string> { "matrix\tstored as\tcells × genes\tfirst values" };
            lines.AddRange(overview.Matrices.Select(m => string.Join('\t', m.Choice.Spelling, m.Layout,
                m.Shape is { Length: 2 } s ? $"{s[0]:N0} × {s[1]:N0}" : "not stated", Values(m))));
            var summary = $"AnnData file: {overview.Cells:N0} cells (obs) × {overview.Genes:N0} genes (var); {overview.Matrices.Count} "
                + $"{(overview.Matrices.Count == 1 ? "matrix" : "matrices")} to choose from.";
            var named = overview with { File = file.Name, Hint = overview.Hint is { } h ? RenameFile(h, overview.File, file.Name) : null };
            return new UploadPreview(lines, summary, named);
        }
        finally
        {
            try { Directory.Delete(dir, recursive: true); } catch (IOException) { }
        }
    }

    /// <summary>What a matrix's first stored values look like, in words.</summary>
    private static string Values(AnnDataMatrixSummary m) => m.Sampled == 0 ? "none stored"
        : (m.AllWhole ? "whole numbers" : "not whole numbers") + $", largest {m.Largest.ToString("G4", System.Globalization.CultureInfo.InvariantCulture)}"
            + $" (first {m.Sampled:N0})";

    /// <summary>Messages name the saved copy; the user sent the file under its own name.</summary>
    private static string RenameFile(string message, string saved, string sent) =>
        message.StartsWith(saved + ":", StringComparison.Ordinal) ? sent + message[saved.Length..] : message;

    /// <summary>The matrix's first stored values under a heading (banner, comments and size line are in the summary).</summary>
    private static IReadOnlyList<string> MatrixEntries(MatrixMarketParts m)
    {
        var entries = TablePreview.FirstLines(m.Matrix, 64).Where(l => l.Length > 0 && !l.StartsWith('%')).Skip(1).Take(7)
            .Select(l => string.Join('\t', l.Split([' ', '\t'], StringSplitOptions.RemoveEmptyEntries)));
        return ["row (gene)\tcolumn (cell)\tvalue", .. entries];
    }

    /// <summary>A lone matrix is sorted like the parts so its missing sidecars are named at once.</summary>
    private static bool LooksLikeMatrix(UploadedFile file) =>
        TablePreviewHead(file).StartsWith("%%MatrixMarket", StringComparison.Ordinal);

    private static string TablePreviewHead(UploadedFile file)
    {
        try { return TablePreview.FirstLines(file.Bytes, file.Name, 1)[0]; }
        catch (Simulation.UserInputException) { return ""; }
    }
}
