namespace ExprModel.Core.Expression;

/// <summary>
/// A contiguous run of cells by position in the file's own cell order (0-based <see cref="Start"/>, <see cref="Count"/>
/// cells): what one shard of an atlas run reads. Readers given a range return only those cells, with the same values
/// and library sizes a full read gives them.
/// </summary>
public readonly record struct CellRange(int Start, int Count)
{
    /// <summary>One past the last cell.</summary>
    public int End => Start + Count;

    public bool Contains(long cell) => cell >= Start && cell < End;

    /// <summary>
    /// The <paramref name="index"/>-th (1-based) of <paramref name="parts"/> contiguous parts of <paramref name="total"/>
    /// cells: cells total*(index-1)/parts up to total*index/parts, the split <c>batch --shard</c> uses for its items.
    /// </summary>
    public static CellRange Part(int index, int parts, int total)
    {
        if (parts < 1 || index < 1 || index > parts) throw new ArgumentOutOfRangeException(nameof(index), $"part {index} of {parts} does not exist.");
        int from = (int)((long)total * (index - 1) / parts), to = (int)((long)total * index / parts);
        return new CellRange(from, to - from);
    }

    /// <summary>Checks the range against the number of cells a file holds.</summary>
    /// <exception cref="ExpressionFormatException">The range reaches past the file's cells (names the file and both counts).</exception>
    internal void CheckWithin(int total, string file)
    {
        if (Start < 0 || Count < 0 || End > total)
            throw new ExpressionFormatException($"{file}: cells {Start}..{End - 1} were asked for but the file holds {total} cells (0..{total - 1}).");
    }

    public override string ToString() => $"cells {Start}..{End - 1}";
}
