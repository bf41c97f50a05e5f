using ExprModel.Web.Hosting;

namespace ExprModel.Web.Workspace;

/// <summary>
/// What the Load page shows of an upload before it is read for real: the first lines of the table (or of the Matrix
/// Market matrix), and for Matrix Market which file was taken for which part. Archives are opened and the parts sorted
/// in a private folder deleted at once, so a bad archive or a missing sidecar is reported on upload.
/// </summary>
public sealed record UploadPreview(IReadOnlyList<string> Lines, string? Summary)
{
    /// <exception cref="Simulation.UserInputException">The upload cannot be used (named file and reason).</exception>
    /// <exception cref="UploadTooLargeException">An archive or sidecar inflates past the limits.</exception>
    public static UploadPreview Of(IReadOnlyList<UploadedFile> files, UploadLimits limits, CancellationToken cancel = default)
    {
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
