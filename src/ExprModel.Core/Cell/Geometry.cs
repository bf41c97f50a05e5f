namespace ExprModel.Core.Cell;

/// <summary>Single-compartment geometry: a sphere-equivalent membrane area and specific capacitance.</summary>
public sealed record Geometry
{
    public required double AreaUm2 { get; init; }
    public double CapacitanceUfPerCm2 { get; init; } = 1.0;

    public static Geometry FromDiameter(double diameterUm, double capacitanceUfPerCm2 = 1.0) =>
        new() { AreaUm2 = Math.PI * diameterUm * diameterUm, CapacitanceUfPerCm2 = capacitanceUfPerCm2 };

    /// <summary>Area from a measured whole-cell capacitance (pF): A = C / c_m, with 1 uF/cm2 = 0.01 pF/um2.</summary>
    public static Geometry FromCapacitance(double capacitancePf, double capacitanceUfPerCm2 = 1.0) =>
        new() { AreaUm2 = capacitancePf / (capacitanceUfPerCm2 * 0.01), CapacitanceUfPerCm2 = capacitanceUfPerCm2 };

    public double AreaCm2 => AreaUm2 * 1e-8;
    public double CapacitancePf => CapacitanceUfPerCm2 * 0.01 * AreaUm2;

    /// <summary>Converts an absolute current (pA) to density (uA/cm2): 1 uA/cm2 on 1000 um2 is 10 pA.</summary>
    public double PicoampsToDensity(double pA) => pA * 100.0 / AreaUm2;
    public double DensityToPicoamps(double uaPerCm2) => uaPerCm2 * AreaUm2 / 100.0;
}
