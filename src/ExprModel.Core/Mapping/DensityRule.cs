namespace ExprModel.Core.Mapping;

/// <summary>What an entry's expression is divided by.</summary>
public enum DensityReference
{
    /// <summary>The median over every cell of the dataset (falls back to the mean when the median is zero).</summary>
    DatasetMedian,
    /// <summary>The mean over the cells of a user-chosen reference group.</summary>
    ReferenceGroup,
}

/// <summary>
/// The explicit, adjustable rule from expression to maximal conductance (DOMAIN.md, "Expression to conductance"):
/// density = typical published density * (expression / reference)^Exponent, clamped to the entry's plausible range.
/// Expression of an entry is the weighted sum of its genes' normalised expression (CPM, TPM or FPKM).
/// </summary>
public sealed record DensityRule
{
    public DensityReference Reference { get; init; } = DensityReference.DatasetMedian;
    public string? ReferenceGroup { get; init; }
    public double Exponent { get; init; } = 1.0;
    public bool ClampToPlausibleRange { get; init; } = true;
    /// <summary>Cell size of the built model: whole-cell capacitance (pF). 50 pF is a small cortical neuron (from memory).</summary>
    public double CapacitancePf { get; init; } = 50;
    /// <summary>Temperature of the built model; 34 C is a common slice-recording temperature (common practice).</summary>
    public double TemperatureC { get; init; } = 34;
    /// <summary>Passive leak added to every model (entry "leak"), mS/cm2 and reversal mV.</summary>
    public double LeakMsPerCm2 { get; init; } = 0.05;
    public double LeakReversalMv { get; init; } = -70;

    /// <summary>The rule relative to the dataset median (null), or to the mean of the named reference group.</summary>
    public static DensityRule RelativeTo(string? referenceGroup) => referenceGroup is null
        ? new DensityRule()
        : new DensityRule { Reference = DensityReference.ReferenceGroup, ReferenceGroup = referenceGroup };

    public string? Problem()
    {
        if (!(Exponent > 0) || Exponent > 4) return "exponent must lie in (0, 4]";
        if (Reference == DensityReference.ReferenceGroup && string.IsNullOrWhiteSpace(ReferenceGroup)) return "a reference group must be named";
        if (!(CapacitancePf > 0)) return "capacitancePf must be positive";
        if (!(LeakMsPerCm2 >= 0)) return "leakMsPerCm2 must be >= 0";
        return null;
    }
}

/// <summary>A user's change to the default mapping of one gene.</summary>
/// <param name="Gene">Official symbol or table identifier.</param>
/// <param name="Exclude">Drop the gene from every entry.</param>
/// <param name="EntryId">Re-point the gene to this entry only (replacing its default links).</param>
/// <param name="Weight">New weight for the gene's links (or for the re-pointed link).</param>
public sealed record GeneOverride(string Gene, bool Exclude = false, string? EntryId = null, double? Weight = null);
