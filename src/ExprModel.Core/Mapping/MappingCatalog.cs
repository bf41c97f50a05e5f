using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Mapping;

/// <summary>What the mapping needs from the catalog: latest entries, gene links, statuses and identifiers.</summary>
public sealed record MappingCatalog(IReadOnlyList<ChannelEntry> Entries, IReadOnlyList<GeneLink> Links, IReadOnlyList<GeneStatus> Statuses,
    IReadOnlyList<GeneIdentifier> Identifiers)
{
    public ChannelEntry? Entry(string id) => Entries.FirstOrDefault(e => e.Id == id);
}
