namespace ExprModel.Core.Mapping;

/// <summary>Which cells a model stands for: one group (mean of its cells) or one cell.</summary>
public sealed record ModelTarget(string? Group, string? CellId)
{
    public static ModelTarget ForGroup(string g) => new(g, null);
    public static ModelTarget ForCell(string c) => new(null, c);
    public string Label => Group is not null ? $"group {Group}" : $"cell {CellId}";
}
