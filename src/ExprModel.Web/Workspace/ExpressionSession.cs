using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;
using ExprModel.Core.Mapping;
using ExprModel.Data.Catalog;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>What the user chose on the Load page; null or empty means "detect".</summary>
public sealed record ReadChoices(string? Orientation, string? Unit, string? GroupColumn)
{
    public ExpressionReadOptions ToOptions(Func<string, bool> keepGene) => new()
    {
        KeepGene = keepGene,
        Orientation = Orientation switch
        {
            null or "" => null,
            "genes-as-rows" => TableOrientation.GenesAsRows,
            "cells-as-rows" => TableOrientation.CellsAsRows,
            var o => throw new UserInputException($"orientation: '{o}' is not genes-as-rows or cells-as-rows."),
        },
        Unit = Unit switch
        {
            null or "" or "log-transformed" => null,
            "counts" => ExpressionUnit.Counts,
            "cpm" => ExpressionUnit.Cpm,
            "tpm" => ExpressionUnit.Tpm,
            "fpkm" => ExpressionUnit.Fpkm,
            var u => throw new UserInputException($"unit: '{u}' is not counts, cpm, tpm or fpkm."),
        },
        LogTransform = Unit == "log-transformed" ? LogTransform.NaturalLog1p : LogTransform.None,
    };
}

/// <summary>
/// An expression table read by the library's readers, grouped by a metadata column and mapped onto the catalog. The web
/// app only orchestrates (uploaded bytes go to a private temporary file because the readers work on files); reading,
/// identifier resolution, mapping and the density rule are all the library's, as in the command line's build command.
/// </summary>
public sealed class ExpressionSession
{
    public required ExpressionTable Table { get; init; }
    public CellMetadata? Metadata { get; init; }
    public CellGroups? Groups { get; init; }
    public required MappingCatalog Catalog { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];
    public required ReadChoices Choices { get; init; }

    public static ExpressionSession Read(ChannelCatalog catalog, byte[] table, string tableName, byte[]? metadata, string? metadataName, ReadChoices choices)
    {
        var mapping = catalog.ForMapping();
        var resolver = new GeneResolver(mapping.Links, mapping.Statuses, mapping.Identifiers);
        var options = choices.ToOptions(resolver.Knows);
        var notes = new List<string>();
        var dir = Path.Combine(Path.GetTempPath(), "exprmodel-upload-" + Guid.NewGuid().ToString("N"));
        Directory.CreateDirectory(dir);
        try
        {
            var tablePath = Path.Combine(dir, SafeName(tableName));
            File.WriteAllBytes(tablePath, table);
            ExpressionTable read;
            try { read = ExpressionReader.Read(tablePath, options); }
            catch (ExpressionFormatException e) { throw new UserInputException(e.Message); }
            catch (ArgumentException e) { throw new UserInputException($"{tableName}: {e.Message}"); }
            CellMetadata? meta = null;
            CellGroups? groups = null;
            if (metadata is not null && !string.IsNullOrEmpty(choices.GroupColumn))
            {
                var metaPath = Path.Combine(dir, "meta-" + SafeName(metadataName ?? "metadata.csv"));
                File.WriteAllBytes(metaPath, metadata);
                try { meta = CellMetadataReader.Read(metaPath, new CellMetadataOptions { GroupColumns = [choices.GroupColumn] }); }
                catch (ExpressionFormatException e) { throw new UserInputException(e.Message); }
                if (!meta.Labels.ContainsKey(choices.GroupColumn))
                    throw new UserInputException($"{metadataName}: no column '{choices.GroupColumn}' (columns: {string.Join(", ", meta.Labels.Keys)}).");
                var labels = new Dictionary<string, string>(StringComparer.Ordinal);
                foreach (var id in read.CellIds)
                    if (meta.Label(choices.GroupColumn, id) is { } g) labels[id] = g;
                groups = new CellGroups(read.CellIds, labels, choices.GroupColumn);
                int missing = read.CellIds.Count - labels.Count;
                if (missing > 0) notes.Add($"{missing} cell(s) of the table have no '{choices.GroupColumn}' label in {metadataName}.");
                if (groups.Members.Count == 0) throw new UserInputException($"{metadataName}: no cell id of the table has a '{choices.GroupColumn}' label; check that the first column holds the table's cell ids.");
            }
            return new ExpressionSession { Table = read, Metadata = meta, Groups = groups, Catalog = mapping, Notes = notes, Choices = choices };
        }
        finally
        {
            try { Directory.Delete(dir, recursive: true); } catch (IOException) { }
        }
    }

    public MappingReport Map(IReadOnlyList<GeneOverride> overrides) => ExpressionMapping.Map(Table, Catalog, overrides);

    /// <summary>Builds the model of one group (or, without groups, one cell).</summary>
    public BuiltModel Build(MappingReport report, DensityRule rule, ModelTarget target)
    {
        if (rule.Problem() is { } p) throw new UserInputException("density rule: " + p);
        try { return ExpressionModelBuilder.Build(Table, report, Catalog, rule, target, Groups); }
        catch (ArgumentException e) { throw new UserInputException(e.Message); }
    }

    /// <summary>The targets a user can build: every group, or every cell when there is no grouping.</summary>
    public IReadOnlyList<ModelTarget> Targets => Groups is not null
        ? Groups.Members.Keys.Select(ModelTarget.ForGroup).ToArray()
        : Table.CellIds.Select(ModelTarget.ForCell).ToArray();

    private static string SafeName(string name)
    {
        var file = Path.GetFileName(name);
        var clean = new string(file.Select(c => char.IsLetterOrDigit(c) || c is '.' or '-' or '_' ? c : '_').ToArray());
        return clean.Length == 0 ? "table.csv" : clean;
    }
}
