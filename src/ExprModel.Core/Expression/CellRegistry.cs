namespace ExprModel.Core.Expression;

/// <summary>Cell identifiers must be unique and non-empty: a duplicated cell would make every per-cell result ambiguous.</summary>
internal sealed class CellRegistry(string file)
{
    private readonly Dictionary<string, string> _firstSeen = new(StringComparer.Ordinal);

    public void Add(string cell, string location)
    {
        if (string.IsNullOrWhiteSpace(cell))
            throw new ExpressionFormatException($"{file}: {location}: empty cell identifier.");
        if (!_firstSeen.TryAdd(cell, location))
            throw new ExpressionFormatException($"{file}: {location}: cell '{cell}' is duplicated (first at {_firstSeen[cell]}).");
    }
}
