using ExprModel.Core.Analysis;

namespace ExprModel.Core.Tests.Analysis;

public class StepSizingTests
{
    [Theory]
    [InlineData(2.468, 2.5)]
    [InlineData(123, 130)]
    [InlineData(0.0731, 0.074)]
    public void Rounds_up_to_two_significant_figures(double x, double expected) =>
        Assert.Equal(expected, StepSizing.RoundUpToTwoSignificantFigures(x), 9);

    [Theory]
    [InlineData(0.0123)]
    [InlineData(0.987)]
    [InlineData(7.3)]
    [InlineData(41.7)]
    [InlineData(1234.5)]
    public void Result_is_the_next_two_figure_number_at_or_above(double x)
    {
        double r = StepSizing.RoundUpToTwoSignificantFigures(x);
        double unit = Math.Pow(10, Math.Floor(Math.Log10(x)) - 1); // one in the second significant figure
        Assert.True(r >= x, $"{r} < {x}");
        Assert.True(r - x < unit * (1 + 1e-9), $"{r} is more than one unit of the second figure above {x}");
        Assert.Equal(Math.Round(r / unit), r / unit, 9);
    }

    [Theory]
    [InlineData(0)]
    [InlineData(-3)]
    [InlineData(double.NaN)]
    public void Without_a_positive_value_the_step_is_one(double x) => Assert.Equal(1, StepSizing.RoundUpToTwoSignificantFigures(x));

    [Theory]
    [InlineData("wb1996")]
    [InlineData("cortex-rs2008")]
    public void Twice_the_rheobase_of_a_published_model_fires_it(string preset)
    {
        var cell = TestCatalog.Preset(preset);
        double rheobase = Features.MeasureFirst(cell, ReadoutSettings.Live).RheobaseUaPerCm2!.Value;
        double step = StepSizing.FromRheobase(rheobase);
        // Rounding to two figures moves a value up by less than 10 %.
        Assert.InRange(step, 2 * rheobase, 2 * rheobase * 1.1);
        var response = FiCurve.Measure(cell, [step], 1000)[0];
        Assert.True(response.SpikesInStep > 0, $"{preset}: no spike at {step} uA/cm2 (rheobase {rheobase})");
    }
}
