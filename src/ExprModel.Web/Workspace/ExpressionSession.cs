using ExprModel.Core.Expression;
using ExprModel.Core.Mapping;
using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The web's hold on an <see cref="ExpressionDataset"/> (the library's read / group / map / build orchestration, shared
/// with the command line): what it adds is web-only. Uploaded bytes go to a private temporary folder because the
/// readers work on files (Matrix Market and AnnData need seeking), library errors become <see cref="UserInputException"/>
/// for a page or a ProblemDetails response, the read choices are kept so the Load page can skip an unchanged re-read,
/// and a metadata table that labels none of the table's cells is refused here rather than on the Map page.
/// </summary>
public sealed class ExpressionSession
{
    public required ExpressionDataset Dataset { get; init; }
    public required ReadChoices Choices { get; init; }

    /// <param name="limits">What the table may inflate to and how many lines it may have; a passed limit is <see cref="UploadTooLargeException"/>.</param>
    /// <param name="cancel">Stops the reading (the request was aborted, the page closed).</param>
    public static ExpressionSession Read(ChannelCatalog catalog, byte[] table, string tableName, byte[]? metadata, string? metadataName, ReadChoices choices,
        UploadLimits? limits = null, CancellationToken cancel = default) =>
        Read(catalog, [new UploadedFile(tableName, table)], metadata, metadataName, choices, limits, cancel);

    /// <summary>
    /// Reads an upload of one or more files: one table, a Matrix Market matrix with its sidecars (as separate files or in
    /// one .zip or .tar.gz archive), or an archive holding one table (<see cref="ExpressionParts"/>).
    /// </summary>
    public static ExpressionSession Read(ChannelCatalog catalog, IReadOnlyList<UploadedFile> table, byte[]? metadata, string? metadataName,
        ReadChoices choices, UploadLimits? limits = null, CancellationToken cancel = default)
    {
        limits ??= UploadLimits.None;
        if (metadata is { Length: 0 }) throw new UserInputException($"{Path.GetFileName(metadataName)}: the file is empty (0 bytes).");
        var options = choices.ToOptions() with { MaxDecompressedBytes = limits.MaxDecompressedBytes, MaxLines = limits.MaxLines, Cancel = cancel };
        var dir = Path.Combine(Path.GetTempPath(), "exprmodel-upload-" + Guid.NewGuid().ToString("N"));
        try
        {
            var parts = ExpressionParts.Receive(table, Path.Combine(dir, "table"), limits, cancel);
            var metadataPath = metadata is not null && !string.IsNullOrEmpty(choices.GroupColumn)
                ? Save(dir, "metadata", metadataName, "metadata.csv", metadata) : null;
            ExpressionDataset dataset;
            string? groupColumn = metadataPath is null ? null : choices.GroupColumn;
            try { dataset = ExpressionDataset.Read(catalog.ForMapping(), parts.TablePath, options, metadataPath, groupColumn, parts.TableName); }
            catch (ExpressionLimitException e) { throw new UploadTooLargeException(parts.Translate(limits.Explain(e))); }
            catch (ExpressionFormatException e) { throw new UserInputException(parts.Translate(e.Message)); }
            catch (ArgumentException e) { throw new UserInputException($"{parts.TableName}: {e.Message}"); }
            if (dataset.Groups is { Members.Count: 0 } && metadataPath is not null)
                throw new UserInputException($"{Path.GetFileName(metadataPath)}: no cell id of the table has a '{choices.GroupColumn}' label; check that "
                    + "the first column holds the table's cell ids.");
            return new ExpressionSession { Dataset = dataset, Choices = choices };
        }
        finally
        {
            try { Directory.Delete(dir, recursive: true); } catch (IOException) { }
        }
    }

    public MappingReport Map(IReadOnlyList<GeneOverride> overrides) => Dataset.Map(overrides);

    /// <summary>Builds the model of one group (or, without groups, one cell); a bad rule or target is the user's to fix.</summary>
    public BuiltModel Build(MappingReport report, DensityRule rule, ModelTarget target)
    {
        try { return Dataset.Build(report, rule, target); }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
    }

    /// <summary>
    /// Writes an upload to its own sub-folder under its own (sanitised) name, so the readers' messages name the file the
    /// user sent and the table and metadata never collide.
    /// </summary>
    private static string Save(string dir, string role, string? name, string fallback, byte[] bytes)
    {
        var folder = Directory.CreateDirectory(Path.Combine(dir, role)).FullName;
        var path = Path.Combine(folder, SafeName(name, fallback));
        File.WriteAllBytes(path, bytes);
        return path;
    }

    /// <summary>A file name safe to create in a private folder: letters, digits, '.', '-' and '_' kept, the rest '_'.</summary>
    internal static string SafeName(string? name, string fallback)
    {
        var file = Path.GetFileName(name ?? "");
        var clean = new string(file.Select(c => char.IsLetterOrDigit(c) || c is '.' or '-' or '_' ? c : '_').ToArray());
        return clean.Trim('.').Length == 0 ? fallback : clean;
    }
}
