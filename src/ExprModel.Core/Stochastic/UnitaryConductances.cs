using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// The reviewed table of unitary conductances (catalog/unitary-conductances.csv): an entry's own row, else its family's
/// labelled default, else the default of last resort ("family:*"), so entries added later get a labelled value
/// without anyone editing the table.
/// </summary>
public sealed class UnitaryConductances
{
    public const string LastResortKey = "family:*";
    private readonly Dictionary<string, UnitaryConductance> _byKey;

    public IReadOnlyList<UnitaryConductance> Rows { get; }

    public UnitaryConductances(IReadOnlyList<UnitaryConductance> rows)
    {
        Rows = rows;
        _byKey = rows.ToDictionary(r => r.Key, StringComparer.Ordinal);
        if (!_byKey.ContainsKey(LastResortKey)) throw new ArgumentException($"the table needs a '{LastResortKey}' row", nameof(rows));
    }

    public UnitaryConductance For(ChannelEntry entry) =>
        _byKey.TryGetValue(entry.Id, out var own) ? own
            : _byKey.TryGetValue("family:" + entry.Family, out var family) ? family
            : _byKey[LastResortKey];
}
