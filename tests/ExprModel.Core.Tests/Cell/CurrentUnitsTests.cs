using ExprModel.Core.Cell;

namespace ExprModel.Core.Tests.Cell;

/// <summary>Current unit conversions (DOMAIN.md units: 1 uA/cm2 on 1000 um2 is 10 pA).</summary>
public sealed class CurrentUnitsTests
{
    [Fact]
    public void GeometryConversionsAreConsistent()
    {
        // 1 uA/cm2 on 1000 um2 is 10 pA (DOMAIN.md units).
        var g = new Geometry { AreaUm2 = 1000 };
        Assert.Equal(10, g.DensityToPicoamps(1), 12);
        Assert.Equal(1, g.PicoampsToDensity(10), 12);
        var d = Geometry.FromDiameter(10);
        Assert.Equal(Math.PI * 100, d.AreaUm2, 9);
        var c = Geometry.FromCapacitance(10); // 10 pF at 1 uF/cm2 = 1000 um2
        Assert.Equal(1000, c.AreaUm2, 9);
    }

    [Fact]
    public void A_slope_per_density_per_nanoamp_is_the_slope_over_the_current_one_density_unit_carries()
    {
        // 1 uA/cm2 on 1000 um2 is 10 pA = 0.01 nA, so 5 Hz per uA/cm2 is 500 Hz/nA; the same through FromDensity.
        var g = new Geometry { AreaUm2 = 1000 };
        Assert.Equal(500, CurrentUnits.PerDensityToPerNanoamp(5, g), 9);
        Assert.Equal(5 / CurrentUnits.FromDensity(1, CurrentUnit.Na, g), CurrentUnits.PerDensityToPerNanoamp(5, g), 9);
    }
}
