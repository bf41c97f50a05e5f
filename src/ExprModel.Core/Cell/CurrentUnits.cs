namespace ExprModel.Core.Cell;

/// <summary>The one place where current units are converted (1 uA/cm2 on 1000 um2 is 10 pA).</summary>
public static class CurrentUnits
{
    public static CurrentUnit Parse(string text) => text.Trim().ToLowerInvariant() switch
    {
        "density" or "ua/cm2" or "uacm2" or "ua-per-cm2" => CurrentUnit.UaPerCm2,
        "pa" => CurrentUnit.Pa,
        "na" => CurrentUnit.Na,
        _ => throw new ArgumentException($"Unknown current unit '{text}': use density (uA/cm2), pA or nA."),
    };

    public static string Label(CurrentUnit u) => u switch { CurrentUnit.UaPerCm2 => "uA/cm2", CurrentUnit.Pa => "pA", _ => "nA" };

    /// <summary>Column-safe suffix: ua_per_cm2, pa, na.</summary>
    public static string Suffix(CurrentUnit u) => u switch { CurrentUnit.UaPerCm2 => "ua_per_cm2", CurrentUnit.Pa => "pa", _ => "na" };

    public static double ToDensity(double value, CurrentUnit unit, Geometry g) => unit switch
    {
        CurrentUnit.UaPerCm2 => value,
        CurrentUnit.Pa => g.PicoampsToDensity(value),
        _ => g.PicoampsToDensity(value * 1000),
    };

    public static double FromDensity(double density, CurrentUnit unit, Geometry g) => unit switch
    {
        CurrentUnit.UaPerCm2 => density,
        CurrentUnit.Pa => g.DensityToPicoamps(density),
        _ => g.DensityToPicoamps(density) / 1000,
    };

    /// <summary>
    /// A slope per unit of current density (for example an f-I gain in Hz per uA/cm2) as a slope per nanoampere for this
    /// cell's area: 1 uA/cm2 on A um2 is A x 1e-5 nA.
    /// </summary>
    public static double PerDensityToPerNanoamp(double perUaPerCm2, Geometry g) => perUaPerCm2 / (g.AreaUm2 * 1e-5);
}
