using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;

namespace ExprModel.Core.Mapping;

/// <summary>
/// An expression table read for mapping, optionally grouped by a label column of a cell metadata table: the one
/// orchestration of read table, read metadata, group, map and build that the command line and the web app share.
/// Everything it calls is the library's (readers, <see cref="GeneResolver"/>, <see cref="ExpressionMapping"/>,
/// <see cref="ExpressionModelBuilder"/>); front ends only turn their own options into the arguments here and its
/// errors into their own messages.
/// </summary>
public sealed class ExpressionDataset
{
    public required ExpressionTable Table { get; init; }
    /// <summary>The metadata table, when one was given.</summary>
    public CellMetadata? Metadata { get; init; }
    /// <summary>The table's cells by label of the group column, when metadata was given.</summary>
    public CellGroups? Groups { get; init; }
    public required MappingCatalog Catalog { get; init; }
    /// <summary>The resolver that chose the table's genes while reading; mapping reuses its resolutions.</summary>
    public required GeneResolver Resolver { get; init; }
    /// <summary>Things the user should know about the reading that are not problems (e.g. cells without a label).</summary>
    public IReadOnlyList<string> Notes { get; init; } = [];

    /// <summary>
    /// Reads the table at <paramref name="tablePath"/> (any format <see cref="ExpressionReader"/> reads), keeping only the
    /// genes the catalog knows, and, when <paramref name="metadataPath"/> is given, groups its cells by
    /// <paramref name="groupColumn"/> of that metadata table.
    /// </summary>
    /// <param name="options">Orientation, unit and log transform as the user stated them; the gene filter is set here.</param>
    /// <param name="sourceName">What to call the table in built models and messages when the path is a temporary copy (default: the path).</param>
    /// <exception cref="ExpressionFormatException">A file cannot be read (the message names file, line and column), or the metadata has no such
    /// column.</exception>
    /// <exception cref="ArgumentException">Metadata without a group column.</exception>
    public static ExpressionDataset Read(MappingCatalog catalog, string tablePath, ExpressionReadOptions options, string? metadataPath = null,
        string? groupColumn = null, string? sourceName = null)
    {
        if (metadataPath is not null && string.IsNullOrEmpty(groupColumn))
            throw new ArgumentException("A metadata table needs the name of its group column.", nameof(groupColumn));
        var resolver = new GeneResolver(catalog.Links, catalog.Statuses, catalog.Identifiers);
        var table = ExpressionReader.Read(tablePath, options with { KeepGene = resolver.Knows });
        if (sourceName is not null) table = table.WithSource(sourceName);
        if (metadataPath is null) return new ExpressionDataset { Table = table, Catalog = catalog, Resolver = resolver };

        var column = groupColumn!;
        var metadataName = Path.GetFileName(metadataPath);
        var metadata = CellMetadataReader.Read(metadataPath, new CellMetadataOptions
        {
            GroupColumns = [column],
            MaxDecompressedBytes = Math.Min(options.MaxDecompressedBytes, new CellMetadataOptions().MaxDecompressedBytes),
            MaxLines = options.MaxLines,
            Cancel = options.Cancel,
        });
        if (!metadata.Labels.ContainsKey(column))
            throw new ExpressionFormatException($"{metadataName}: no column '{column}' (columns: {string.Join(", ", metadata.Labels.Keys)}).");
        var labels = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var id in table.CellIds)
            if (metadata.Label(column, id) is { } label) labels[id] = label;
        var notes = new List<string>();
        int unlabelled = table.CellIds.Count - labels.Count;
        if (unlabelled > 0) notes.Add($"{unlabelled} cell(s) of the table have no '{column}' label in {metadataName}.");
        return new ExpressionDataset
        {
            Table = table,
            Metadata = metadata,
            Groups = new CellGroups(table.CellIds, labels, column),
            Catalog = catalog,
            Resolver = resolver,
            Notes = notes
        };
    }

    /// <summary>Maps the table's genes onto the catalog with the user's overrides.</summary>
    public MappingReport Map(IReadOnlyList<GeneOverride>? overrides = null) => ExpressionMapping.Map(Table, Catalog, overrides, Resolver);

    /// <summary>Builds the model of one group (the mean of its cells) or one cell.</summary>
    /// <param name="shrinkage">Per-cell estimates from <see cref="Shrink"/> for a cell's model; null builds from the cell's raw values.</param>
    /// <exception cref="ArgumentException">An unknown group or cell, or a rule that cannot be applied (names which).</exception>
    public BuiltModel Build(MappingReport report, DensityRule rule, ModelTarget target, PerCellShrinkage? shrinkage = null) =>
        shrinkage?.Build(Catalog, rule, target, Groups) ?? ExpressionModelBuilder.Build(Table, report, Catalog, rule, target, Groups);

    /// <summary>Per-cell expression shrunk towards each cell's group (<see cref="PerCellShrinkage"/>) for this mapping.</summary>
    /// <param name="priors">Priors fitted earlier over the whole table (a part of an atlas read by cell range); null fits them over this table.</param>
    /// <exception cref="ArgumentException">A mapped gene or a cell's prior set has no stored prior (names which).</exception>
    public PerCellShrinkage Shrink(MappingReport report, ShrinkagePriors? priors = null) =>
        priors is null ? new(Table, report, Groups) : PerCellShrinkage.FromPriors(Table, report, Groups, priors);

    /// <summary>The targets a user can build: every group, or every cell when there is no grouping.</summary>
    public IReadOnlyList<ModelTarget> Targets => Groups is not null ? GroupTargets(Groups) : CellTargets;

    /// <summary>One target per cell of the table.</summary>
    public IReadOnlyList<ModelTarget> CellTargets => Table.CellIds.Select(ModelTarget.ForCell).ToArray();

    private static ModelTarget[] GroupTargets(CellGroups groups) => groups.Members.Keys.Select(ModelTarget.ForGroup).ToArray();
}
