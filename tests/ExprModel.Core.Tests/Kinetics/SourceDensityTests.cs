using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Tests.Kinetics;

/// <summary>Conductance as a paper states it, turned into mS/cm2 by unit arithmetic (SI prefixes; no recalled values).</summary>
public class SourceDensityTests
{
    [Fact]
    public void Conductance_in_a_cell_of_given_capacitance_becomes_a_density()
    {
        // 2.8 nS over 21 pF at 1 uF/cm2: area 21e-12 F / 1e-6 F/cm2 = 2.1e-5 cm2; 2.8e-6 mS / 2.1e-5 cm2 = 0.1333 mS/cm2.
        var d = new SourceDensity(2.8, "nS", 21, null, 1, "test");
        Assert.Null(d.Problem());
        Assert.Equal(2.8e-6 / 2.1e-5, d.MsPerCm2, 12);
        // 0.9 uF/cm2 makes the same capacitance a larger area, so a smaller density.
        Assert.Equal(2.8e-6 / (21e-12 / 0.9e-6), new SourceDensity(2.8, "nS", 21, null, 0.9, "test").MsPerCm2, 12);
    }

    [Fact]
    public void Conductance_over_an_area_and_other_units_become_densities()
    {
        // 100 nS over 10000 um2 (1e-4 cm2) = 1e-4 mS / 1e-4 cm2 = 1 mS/cm2.
        Assert.Equal(1, new SourceDensity(100, "nS", null, 10000, 1, "test").MsPerCm2, 12);
        Assert.Equal(36, new SourceDensity(0.036, "S/cm2", null, null, 1, "test").MsPerCm2, 12);
        // 1 pS/um2 = 1e-9 mS per 1e-8 cm2.
        Assert.Equal(0.1, new SourceDensity(1, "pS/um2", null, null, 1, "test").MsPerCm2, 12);
        Assert.Equal(5, new SourceDensity(5, "mS/cm2", null, null, 1, "test").MsPerCm2, 12);
    }

    [Fact]
    public void Incomplete_or_unknown_statements_are_refused_with_the_field_named()
    {
        Assert.Contains("exactly one of capacitancePf and areaUm2", new SourceDensity(2.8, "nS", null, null, 1, "t").Problem());
        Assert.Contains("exactly one of capacitancePf and areaUm2", new SourceDensity(2.8, "nS", 21, 100, 1, "t").Problem());
        Assert.Contains("sourceDensity.unit 'mS'", new SourceDensity(2.8, "mS", null, null, 1, "t").Problem());
        Assert.Contains("capacitancePf must be positive", new SourceDensity(2.8, "nS", 0, null, 1, "t").Problem());
        Assert.Equal("2.8 nS in 21 pF (1 uF/cm2) = 0.133 mS/cm2", new SourceDensity(2.8, "nS", 21, null, 1, "t").Describe());
    }
}
