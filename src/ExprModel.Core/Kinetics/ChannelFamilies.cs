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
        // TTX-resistant sensory-neuron sodium (Nav1.8): activation about 15-20 mV and inactivation about 30-40 mV more depolarised
        // than the TTX-sensitive channels (Elliott & Elliott 1993, J Physiol 463:39; band edges common practice, from memory).
        ["Nav-TTXR"] = new("Nav-TTXR", -35, -5, -50, -20),
        // Persistent TTX-resistant sodium of nociceptors (Nav1.9): activation and inactivation overlap near -50 mV (rat DRG ranges
        // -47 to -54 and -44 to -54 mV in the sodium-channel compendium, Catterall et al. 2005; band edges from memory).
        ["Nav-TTXR-persistent"] = new("Nav-TTXR-persistent", -60, -40, -60, -35),
        // EAG (Kv10): non-inactivating, activation near 0 mV; Kv10.2 starts lower (from memory).
        ["Kv10"] = new("Kv10", -40, 30),
        // ERG (Kv11): slow activation near -10 to -30 mV, fast inactivation with midpoint far negative (-50 to -90 mV, from memory).
        ["Kv11"] = new("Kv11", -40, 5, -110, -40),
        // ELK (Kv12): slow subthreshold activation (KCNH8 half-activation -62 mV, Zou et al. 2003; band from memory).
        ["Kv12"] = new("Kv12", -80, -20),
    };

    /// <summary>Families without a voltage band (leak, calcium-gated, inward rectifier, historical).</summary>
    public static readonly IReadOnlySet<string> Unbanded = new HashSet<string> { "leak", "SK", "BK", "KNa", "Kir", "K2P", "historical", "Kdr-model" };
}
