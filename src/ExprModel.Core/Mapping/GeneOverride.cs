namespace ExprModel.Core.Mapping;

/// <summary>A user's change to the default mapping of one gene.</summary>
/// <param name="Gene">Official symbol or table identifier.</param>
/// <param name="Exclude">Drop the gene from every entry.</param>
/// <param name="EntryId">Re-point the gene to this entry only (replacing its default links).</param>
/// <param name="Weight">New weight for the gene's links (or for the re-pointed link).</param>
public sealed record GeneOverride(string Gene, bool Exclude = false, string? EntryId = null, double? Weight = null);
