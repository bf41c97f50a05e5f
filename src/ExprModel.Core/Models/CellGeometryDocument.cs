using ExprModel.Core.Cell;

namespace ExprModel.Core.Models;

/// <summary>Geometry as written in a model file: exactly one of area, diameter or whole-cell capacitance.</summary>
public sealed record CellGeometryDocument
{
    public double? AreaUm2 { get; init; }
    public double? DiameterUm { get; init; }
    public double? CapacitancePf { get; init; }
    public double CapacitanceUfPerCm2 { get; init; } = 1.0;

    public Geometry ToGeometry()
    {
        int given = (AreaUm2 is null ? 0 : 1) + (DiameterUm is null ? 0 : 1) + (CapacitancePf is null ? 0 : 1);
        if (given != 1) throw new ModelFileException("cell: give exactly one of areaUm2, diameterUm or capacitancePf.");
        if (!(CapacitanceUfPerCm2 > 0)) throw new ModelFileException("cell.capacitanceUfPerCm2 must be positive.");
        if (AreaUm2 is { } a) return a > 0 ? new Geometry { AreaUm2 = a, CapacitanceUfPerCm2 = CapacitanceUfPerCm2 }
            : throw new ModelFileException("cell.areaUm2 must be positive.");
        if (DiameterUm is { } d)
            return d > 0 ? Geometry.FromDiameter(d, CapacitanceUfPerCm2) : throw new ModelFileException("cell.diameterUm must be positive.");
        return CapacitancePf > 0 ? Geometry.FromCapacitance(CapacitancePf!.Value, CapacitanceUfPerCm2)
            : throw new ModelFileException("cell.capacitancePf must be positive.");
    }
}
