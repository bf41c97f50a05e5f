using System.Globalization;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Mapping;

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
    /// <summary>Cell size of the built model: whole-cell capacitance (pF).</summary>
    public double CapacitancePf { get; init; } = ModelDefaults.CapacitancePf;
    /// <summary>Temperature of the built model (C).</summary>
    public double TemperatureC { get; init; } = ModelDefaults.TemperatureC;
    /// <summary>Passive leak added to every model (entry "leak"), mS/cm2 and reversal mV.</summary>
    public double LeakMsPerCm2 { get; init; } = ModelDefaults.LeakMsPerCm2;
    public double LeakReversalMv { get; init; } = ModelDefaults.LeakReversalMv;

    /// <summary>
    /// References computed beforehand over the whole dataset, by entry id (<see cref="DatasetReferences"/>): a part of
    /// an atlas read on its own (one shard's cells) then divides by the whole dataset's reference, as a full read does.
    /// Null computes the reference from the cells at hand.
    /// </summary>
    public IReadOnlyDictionary<string, double>? FixedReferences { get; init; }

    /// <summary>The rule relative to the dataset median (null), or to the mean of the named reference group.</summary>
    public static DensityRule RelativeTo(string? referenceGroup) => referenceGroup is null
        ? new DensityRule()
        : new DensityRule { Reference = DensityReference.ReferenceGroup, ReferenceGroup = referenceGroup };

    /// <summary>The rule in words, as a built model's derivation records it.</summary>
    public const string Method = "density = typical * (expression / reference)^exponent, clamped to the entry's plausible range";

    /// <summary>What the expression is divided by, in words ("dataset median" or "group X").</summary>
    public string ReferenceLabel => Reference == DensityReference.ReferenceGroup ? $"group {ReferenceGroup}" : "dataset median";

    /// <summary>
    /// The density of one entry: its expression averaged over <paramref name="targetCells"/>, divided by the reference
    /// (the mean over <paramref name="referenceCells"/> when the rule names a group, else the median over every cell, or
    /// the mean when the median is zero), raised to <see cref="Exponent"/>, times the entry's typical density, and
    /// clamped to its plausible range when <see cref="ClampToPlausibleRange"/> is set.
    /// </summary>
    /// <param name="expressionByCell">The entry's expression in every cell of the table (weighted sum of its genes).</param>
    /// <param name="referenceCells">The reference group's cells; required when <see cref="Reference"/> is a group.</param>
    public EntryDensity DensityFor(ChannelEntry entry, double[] expressionByCell, int[] targetCells, int[]? referenceCells)
    {
        if (Reference == DensityReference.ReferenceGroup && referenceCells is null && FixedReferences is null)
            throw new ArgumentException($"The density rule refers to group '{ReferenceGroup}' but no cells of it were given.", nameof(referenceCells));
        double expression = targetCells.Average(i => expressionByCell[i]);
        double reference = FixedReferences is { } fixedReferences
            ? fixedReferences.TryGetValue(entry.Id, out var r) ? r
                : throw new ArgumentException($"The precomputed references hold no value for entry '{entry.Id}' (computed with other genes or overrides?).")
            : ReferenceOf(expressionByCell, referenceCells);
        double ratio = reference > 0 ? expression / reference : 0;
        double raw = entry.TypicalDensityMsPerCm2 * Math.Pow(ratio, Exponent);
        if (!(ClampToPlausibleRange && raw > 0 && (raw < entry.MinDensityMsPerCm2 || raw > entry.MaxDensityMsPerCm2)))
            return new EntryDensity(expression, reference, ratio, raw, raw, false, null);
        double clamped = Math.Clamp(raw, entry.MinDensityMsPerCm2, entry.MaxDensityMsPerCm2);
        return new EntryDensity(expression, reference, ratio, raw, clamped, true,
            $"{entry.Id}: predicted {raw:G3} mS/cm2 lies outside the plausible range {entry.MinDensityMsPerCm2:G3}-{entry.MaxDensityMsPerCm2:G3}; " +
                $"clamped to {clamped:G3}.");
    }

    /// <summary>
    /// What an entry's expression is divided by: the mean over <paramref name="referenceCells"/> when the rule names a
    /// group, else the median over every cell (the mean when the median is zero).
    /// </summary>
    public double ReferenceOf(double[] expressionByCell, int[]? referenceCells)
    {
        if (Reference == DensityReference.ReferenceGroup) return referenceCells!.Average(i => expressionByCell[i]);
        double reference = Median(expressionByCell);
        return reference <= 0 ? expressionByCell.Average() : reference;
    }

    /// <summary>One density's derivation as a line of text: "  12.5 mS/cm2 = 10 x (4.2 / 3.1)^1 [clamped]".</summary>
    public string Formula(DensityDerivation d) => string.Create(CultureInfo.InvariantCulture,
        $"{d.DensityMsPerCm2,10:G4} mS/cm2 = {d.TypicalMsPerCm2:G4} x ({d.Expression:G4} / {d.Reference:G4})^{Exponent:G3}{(d.Clamped ? " [clamped]" : "")}");

    private static double Median(double[] v)
    {
        if (v.Length == 0) return 0;
        var s = (double[])v.Clone();
        Array.Sort(s);
        return s.Length % 2 == 1 ? s[s.Length / 2] : 0.5 * (s[s.Length / 2 - 1] + s[s.Length / 2]);
    }

    public string? Problem()
    {
        if (!(Exponent > 0) || Exponent > 4) return "exponent must lie in (0, 4]";
        if (Reference == DensityReference.ReferenceGroup && string.IsNullOrWhiteSpace(ReferenceGroup)) return "a reference group must be named";
        if (!(CapacitancePf > 0)) return "capacitancePf must be positive";
        if (Cell.CellModel.TemperatureProblem(TemperatureC) is { } t) return t;
        if (!(LeakMsPerCm2 >= 0)) return "leakMsPerCm2 must be >= 0";
        return null;
    }
}
