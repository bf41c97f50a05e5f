using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;

namespace ExprModel.Core.Tests.Cell;

public class MeasurementUnitsTests
{
    [Fact]
    public void EveryReadoutUnitIsKnown()
    {
        foreach (var (name, unit, _) in new CellReadouts().Rows())
            Assert.True(MeasurementUnits.Parse(unit) is not null, $"{name}: unit '{unit}' is not known to the unit module");
    }

    [Theory]
    // SI prefixes (identities): 1 nA = 1000 pA, 1 GOhm = 1000 MOhm, 1 s = 1000 ms, 1 V = 1000 mV, 1 V/s = 1 mV/ms, 1 Hz/pA = 1000 Hz/nA.
    [InlineData(1.5, "nA", "pA", 1500)]
    [InlineData(0.25, "GOhm", "MOhm", 250)]
    [InlineData(0.2, "s", "ms", 200)]
    [InlineData(-0.07, "V", "mV", -70)]
    [InlineData(350, "V/s", "mV/ms", 350)]
    [InlineData(0.1, "Hz/pA", "Hz/nA", 100)]
    [InlineData(35, "%", "fraction", 0.35)]
    [InlineData(120, "MΩ", "MOhm", 120)]
    public void ConvertsWithinAQuantity(double value, string from, string to, double expected) =>
        Assert.Equal(expected, MeasurementUnits.Convert(value, MeasurementUnits.Parse(from)!, MeasurementUnits.Parse(to)!), 9);

    [Fact]
    public void ConvertsCurrentAndDensityWithTheCellsArea()
    {
        // DOMAIN.md: 1 uA/cm2 on 1000 um2 is 10 pA (1e-6 A/cm2 x 1e-5 cm2 = 1e-11 A).
        var pa = MeasurementUnits.Parse("pA")!;
        var density = MeasurementUnits.Parse("uA/cm2")!;
        Assert.Equal(1.0, MeasurementUnits.Convert(10, pa, density, 1000), 12);
        Assert.Equal(0.01, MeasurementUnits.Convert(1, density, MeasurementUnits.Parse("nA")!, 1000), 12);
        Assert.False(MeasurementUnits.CanConvert(pa, density, withArea: false));
        Assert.True(MeasurementUnits.CanConvert(pa, density, withArea: true));
        Assert.Throws<ArgumentException>(() => MeasurementUnits.Convert(10, pa, density));
    }

    [Fact]
    public void RefusesUnitsOfAnotherQuantityAndSpellingsThatNameAnotherUnit()
    {
        Assert.Throws<ArgumentException>(() => MeasurementUnits.Convert(1, MeasurementUnits.Parse("mV")!, MeasurementUnits.Parse("ms")!));
        // Case matters: mOhm is a milliohm, S a siemens, Pa a pascal.
        Assert.Null(MeasurementUnits.Parse("mOhm"));
        Assert.Null(MeasurementUnits.Parse("S"));
        Assert.Null(MeasurementUnits.Parse("Pa"));
        Assert.Null(MeasurementUnits.Parse("furlongs"));
    }
}
