namespace ExprModel.Core.Cell;

/// <summary>Ionic concentrations (mM) inside and outside the cell.</summary>
public sealed record IonConcentrations
{
    public double SodiumInsideMm { get; init; } = 10;
    public double SodiumOutsideMm { get; init; } = 145;
    public double PotassiumInsideMm { get; init; } = 140;
    public double PotassiumOutsideMm { get; init; } = 5;
    public double CalciumInsideMm { get; init; } = 5e-5;
    public double CalciumOutsideMm { get; init; } = 2;
    public double ChlorideInsideMm { get; init; } = 10;
    public double ChlorideOutsideMm { get; init; } = 130;

    /// <summary>Mammalian artificial cerebrospinal fluid and a typical neuronal cytoplasm (common practice).</summary>
    public static IonConcentrations Mammalian { get; } = new();

    public string? Problem()
    {
        foreach (var (name, v) in new[] { ("sodiumInsideMm", SodiumInsideMm), ("sodiumOutsideMm", SodiumOutsideMm), ("potassiumInsideMm", PotassiumInsideMm),
            ("potassiumOutsideMm", PotassiumOutsideMm), ("calciumInsideMm", CalciumInsideMm), ("calciumOutsideMm", CalciumOutsideMm),
            ("chlorideInsideMm", ChlorideInsideMm), ("chlorideOutsideMm", ChlorideOutsideMm) })
            if (!(v > 0) || double.IsInfinity(v)) return $"{name} must be a positive number (got {v})";
        return null;
    }
}
