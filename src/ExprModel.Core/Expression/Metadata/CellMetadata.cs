namespace ExprModel.Core.Expression.Metadata;

/// <summary>
/// Per-cell information beside an expression table: cell ids, group labels (one or more label columns, e.g. a
/// transcriptomic type and a region) and recorded electrophysiology columns with their units.
/// </summary>
public sealed class CellMetadata
{
    public required string Source { get; init; }
    /// <summary>Header of the column the cell ids came from.</summary>
    public required string CellIdColumn { get; init; }
    public required IReadOnlyList<string> CellIds { get; init; }
    /// <summary>Label columns by header: one label per cell (null where missing).</summary>
    public required IReadOnlyDictionary<string, string?[]> Labels { get; init; }
    public required IReadOnlyList<RecordedColumn> Recorded { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];

    private Dictionary<string, int>? _index;

    /// <summary>Row of a cell, or -1 when the metadata does not list it.</summary>
    public int IndexOf(string cellId)
    {
        _index ??= CellIds.Select((id, i) => (id, i)).ToDictionary(p => p.id, p => p.i, StringComparer.Ordinal);
        return _index.GetValueOrDefault(cellId, -1);
    }

    /// <summary>A cell's label in a label column, or null when the cell or label is missing.</summary>
    public string? Label(string column, string cellId)
    {
        if (!Labels.TryGetValue(column, out var labels))
            throw new KeyNotFoundException($"{Path.GetFileName(Source)}: no label column '{column}' (have: {string.Join(", ", Labels.Keys)}).");
        int i = IndexOf(cellId);
        return i < 0 ? null : labels[i];
    }

    /// <summary>Distinct labels of a column, in order of first appearance.</summary>
    public IReadOnlyList<string> Groups(string column)
    {
        if (!Labels.TryGetValue(column, out var labels))
            throw new KeyNotFoundException($"{Path.GetFileName(Source)}: no label column '{column}' (have: {string.Join(", ", Labels.Keys)}).");
        return labels.OfType<string>().Distinct(StringComparer.Ordinal).ToList();
    }

    /// <summary>Cells carrying a label in a column, in file order.</summary>
    public IReadOnlyList<string> CellsIn(string column, string label)
    {
        var labels = Labels[column];
        return CellIds.Where((_, i) => labels[i] == label).ToList();
    }

    public RecordedColumn? RecordedColumn(string nameOrHeader) =>
        Recorded.FirstOrDefault(c => c.Header == nameOrHeader) ?? Recorded.FirstOrDefault(c => c.Name == nameOrHeader);
}
