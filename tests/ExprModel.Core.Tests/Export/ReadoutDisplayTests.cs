using ExprModel.Core.Export;
using ExprModel.Core.Perturbation;

namespace ExprModel.Core.Tests.Export;

public sealed class ReadoutDisplayTests
{
    [Theory]
    // Resolutions per unit are the project's choice (about what a careful recording resolves; common practice).
    [InlineData(1.369e-12, "fraction", "0")]
    [InlineData(-3e-9, "mV", "0")]
    [InlineData(0.12345, "fraction", "0.123")]
    [InlineData(-64.0175643, "mV", "-64.02")]
    [InlineData(182.449, "MOhm", "182.4")]
    [InlineData(0.00123, "uA/cm2", "0.0012")]
    [InlineData(2.0, "1 or 2", "2")]
    [InlineData(1.5e10, "MOhm", "1.5E+10")]
    public void ShowsEachUnitToItsResolution(double value, string unit, string shown) => Assert.Equal(shown, ReadoutDisplay.Format(value, unit));

    [Fact]
    public void UndefinedValuesShowAsADash()
    {
        Assert.Equal("—", ReadoutDisplay.Format(null, "mV"));
        Assert.Equal("—", ReadoutDisplay.Format(double.NaN, "mV"));
    }

    [Fact]
    public void ShownValueIsTheValueRoundedToItsDecimals()
    {
        // Against plain decimal rounding of the same number (System.Math), for every unit the table knows.
        foreach (var unit in new[] { "mV", "ms", "MOhm", "fraction", "uA/cm2", "pA", "Hz", "Hz/nA", "mV/ms" })
        {
            int d = ReadoutDisplay.Decimals(unit)!.Value;
            foreach (double v in new[] { -71.234567, 0.98765, 12.3456789, 345.6789 })
                Assert.Equal(Math.Round(v, d, MidpointRounding.AwayFromZero),
                    double.Parse(ReadoutDisplay.Format(v, unit), System.Globalization.CultureInfo.InvariantCulture));
        }
    }

    [Fact]
    public void EveryReadoutUnitHasAResolution()
    {
        // A read-out added later must say how it is shown, or it falls back to significant digits without noticing.
        foreach (var (name, unit) in ReadoutNamesAndUnits())
            Assert.True(ReadoutDisplay.Decimals(unit) is not null, $"{name}: unit '{unit}' has no display resolution in ReadoutDisplay");
    }

    private static IEnumerable<(string Name, string Unit)> ReadoutNamesAndUnits() =>
        ReadoutValues.Names.Select(n => (n.Name, n.Unit));
}
