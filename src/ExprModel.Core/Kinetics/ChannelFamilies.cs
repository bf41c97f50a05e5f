namespace ExprModel.Core.Kinetics;

/// <summary>
/// The channel families the catalog knows and their half-activation bands for mammalian neuronal channels
/// (common practice, from memory; wide plausibility bands, not targets). Squid-axon and other historical
/// entries use family "historical" and are checked against their own published values instead.
/// </summary>
public static class ChannelFamilies
{
    public static readonly IReadOnlyDictionary<string, FamilyBand> Bands = new Dictionary<string, FamilyBand>
    {
        ["Nav-transient"] = new("Nav-transient", -45, -20),
        ["Nav-persistent"] = new("Nav-persistent", -60, -40),
        ["Kv1"] = new("Kv1", -60, -20),
        ["Kv2"] = new("Kv2", -30, 10),
        ["Kv3"] = new("Kv3", -10, 25),
        ["Kv4"] = new("Kv4", -50, -10, -90, -60),
        ["Kv7"] = new("Kv7", -45, -20),
        ["HCN"] = new("HCN", -110, -65),
        ["Cav3"] = new("Cav3", -65, -40, -90, -65),
        ["Cav-HVA"] = new("Cav-HVA", -45, 5),
    };

    /// <summary>Families without a voltage band (leak, calcium-gated, inward rectifier, historical).</summary>
    public static readonly IReadOnlySet<string> Unbanded = new HashSet<string> { "leak", "SK", "BK", "KNa", "Kir", "K2P", "historical", "Kdr-model" };
}
