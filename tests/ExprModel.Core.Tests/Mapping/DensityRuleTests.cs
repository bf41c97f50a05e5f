using ExprModel.Core.Kinetics;
using ExprModel.Core.Mapping;

namespace ExprModel.Core.Tests.Mapping;

/// <summary>
/// The density rule of DOMAIN.md ("Expression to conductance"), density = typical x (expression / reference)^exponent,
/// checked by identities on the repository's traub-na entry: a target at the reference gets the typical density, the
/// exponent acts as a power law, and clamping stops at the entry's plausible range.
/// </summary>
public class DensityRuleTests
{
    private static readonly ChannelEntry Na = TestCatalog.Catalog.Resolve("traub-na", null);

    // Four cells; the median of 1, 2, 4, 8 is (2 + 4) / 2 = 3 (even count: mean of the middle two).
    private static readonly double[] Expression = [1, 2, 4, 8];

    [Fact]
    public void TargetAtTheMedianGetsTheTypicalDensity()
    {
        var d = new DensityRule().DensityFor(Na, [1, 3, 3, 8], [1], null);
        Assert.Equal(3, d.Reference, 12);
        Assert.Equal(1, d.Ratio, 12);
        Assert.Equal(Na.TypicalDensityMsPerCm2, d.DensityMsPerCm2, 12);
        Assert.False(d.Clamped);
        Assert.Null(d.ClampNote);
    }

    [Fact]
    public void EvenCountMedianIsTheMeanOfTheMiddleTwo()
    {
        var d = new DensityRule { ClampToPlausibleRange = false }.DensityFor(Na, Expression, [2], null);
        Assert.Equal(3, d.Reference, 12);
        Assert.Equal(4.0 / 3, d.Ratio, 12);
    }

    [Fact]
    public void ExponentIsAPowerLaw()
    {
        // (r^a)^2 = r^(2a): the squared ratio at exponent 1 equals the ratio at exponent 2.
        var linear = new DensityRule { ClampToPlausibleRange = false }.DensityFor(Na, Expression, [3], null);
        var square = new DensityRule { ClampToPlausibleRange = false, Exponent = 2 }.DensityFor(Na, Expression, [3], null);
        Assert.Equal(Na.TypicalDensityMsPerCm2 * linear.Ratio * linear.Ratio, square.RawMsPerCm2, 9);
    }

    [Fact]
    public void ZeroMedianFallsBackToTheMean()
    {
        var d = new DensityRule().DensityFor(Na, [0, 0, 0, 4], [3], null);
        Assert.Equal(1, d.Reference, 12);
    }

    [Fact]
    public void ReferenceGroupIsTheMeanOfItsCells()
    {
        var rule = DensityRule.RelativeTo("A");
        var d = rule.DensityFor(Na, Expression, [3], [0, 1]);
        Assert.Equal(1.5, d.Reference, 12);
        Assert.Equal("group A", rule.ReferenceLabel);
        Assert.Throws<ArgumentException>(() => rule.DensityFor(Na, Expression, [3], null));
    }

    [Fact]
    public void ClampStopsAtTheMaximumAndSaysSo()
    {
        // Ratio 8 / 3 at exponent 4 is about 50 x typical, beyond any entry's plausible range.
        var d = new DensityRule { Exponent = 4 }.DensityFor(Na, Expression, [3], null);
        Assert.True(d.Clamped);
        Assert.Equal(Na.MaxDensityMsPerCm2, d.DensityMsPerCm2);
        Assert.True(d.RawMsPerCm2 > Na.MaxDensityMsPerCm2);
        Assert.StartsWith("traub-na: predicted", d.ClampNote);
        var free = new DensityRule { Exponent = 4, ClampToPlausibleRange = false }.DensityFor(Na, Expression, [3], null);
        Assert.Equal(d.RawMsPerCm2, free.DensityMsPerCm2);
    }

    [Fact]
    public void FormulaShowsTheDerivation()
    {
        var rule = new DensityRule();
        var line = rule.Formula(new DensityDerivation("traub-na", 1, 4, 2, 2, 100, 200, 150, true, []));
        Assert.Equal("       150 mS/cm2 = 100 x (4 / 2)^1 [clamped]", line);
    }
}
