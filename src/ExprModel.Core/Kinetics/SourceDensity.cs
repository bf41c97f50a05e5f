namespace ExprModel.Core.Kinetics;

/// <summary>
/// A maximal conductance as the source paper states it, with what is needed to turn it into a density: an absolute
/// conductance (nS) with the cell's capacitance (pF, at <see cref="CapacitanceUfPerCm2"/>) or area (um2), or a density in
/// another unit. <see cref="MsPerCm2"/> is what the entry's typical density should be when it follows the paper.
/// </summary>
/// <param name="Value">The stated value, in <paramref name="Unit"/>.</param>
/// <param name="Unit">One of <c>nS</c> (needs a capacitance or an area), <c>mS/cm2</c>, <c>S/cm2</c>, <c>pS/um2</c>.</param>
/// <param name="CapacitancePf">Whole-cell capacitance the paper gives for the conductance (pF).</param>
/// <param name="AreaUm2">Membrane area the paper gives for the conductance (um2).</param>
/// <param name="CapacitanceUfPerCm2">Specific capacitance used to turn capacitance into area (about 1, common practice).</param>
/// <param name="Where">Where the paper states it (table, figure, text).</param>
public sealed record SourceDensity(double Value, string Unit, double? CapacitancePf, double? AreaUm2, double CapacitanceUfPerCm2, string Where)
{
    /// <summary>Units <see cref="Unit"/> may take.</summary>
    public static readonly IReadOnlyList<string> Units = ["nS", "mS/cm2", "S/cm2", "pS/um2"];

    /// <summary>The stated value as a density in mS/cm2.</summary>
    public double MsPerCm2 => Unit switch
    {
        // 1 nS = 1e-6 mS; area (cm2) = C (pF) * 1e-12 F / (Cm (uF/cm2) * 1e-6 F/cm2) = C * 1e-6 / Cm.
        "nS" when CapacitancePf is { } c => Value * CapacitanceUfPerCm2 / c,
        // area (cm2) = um2 * 1e-8: density = nS * 1e-6 / (um2 * 1e-8) = 100 * nS / um2.
        "nS" when AreaUm2 is { } a => 100 * Value / a,
        "mS/cm2" => Value,
        "S/cm2" => 1000 * Value,
        // 1 pS/um2 = 1e-9 mS / 1e-8 cm2 = 0.1 mS/cm2.
        "pS/um2" => 0.1 * Value,
        _ => double.NaN,
    };

    /// <summary>The first problem found, or null: a known unit, a positive value, and for nS exactly one of capacitance and area.</summary>
    public string? Problem()
    {
        if (!Units.Contains(Unit)) return $"sourceDensity.unit '{Unit}' is not one of {string.Join(", ", Units)}";
        if (!(Value >= 0) || double.IsInfinity(Value)) return "sourceDensity.value must be a finite number >= 0";
        if (!(CapacitanceUfPerCm2 > 0)) return "sourceDensity.capacitanceUfPerCm2 must be positive";
        if (Unit == "nS" && (CapacitancePf is null) == (AreaUm2 is null))
            return "sourceDensity in nS needs exactly one of capacitancePf and areaUm2";
        if (CapacitancePf is { } c && !(c > 0)) return "sourceDensity.capacitancePf must be positive";
        if (AreaUm2 is { } a && !(a > 0)) return "sourceDensity.areaUm2 must be positive";
        return null;
    }

    /// <summary>One line for reports: "2.8 nS in 21 pF (1 uF/cm2) = 0.133 mS/cm2".</summary>
    public string Describe()
    {
        var inv = System.Globalization.CultureInfo.InvariantCulture;
        string basis = CapacitancePf is { } c ? string.Create(inv, $" in {c:G4} pF ({CapacitanceUfPerCm2:G3} uF/cm2)")
            : AreaUm2 is { } a ? string.Create(inv, $" over {a:G5} um2") : "";
        return string.Create(inv, $"{Value:G4} {Unit}{basis} = {MsPerCm2:G3} mS/cm2");
    }
}
