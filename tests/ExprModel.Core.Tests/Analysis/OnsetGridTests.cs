using ExprModel.Core.Analysis;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>The onset search's amplitude grid: spacing within the stated tolerance, and index look-ups that invert it.</summary>
public sealed class OnsetGridTests
{
    [Theory]
    [InlineData(0.001, 0.005)]
    [InlineData(0.005, 0.02)]
    [InlineData(0.05, 0.05)]
    public void Grid_spacing_never_exceeds_the_tolerance_and_indices_invert(double abs, double rel)
    {
        var grid = new OnsetGrid(abs, rel);
        for (long n = 1; n < 3000; n++)
        {
            double a = grid.At(n - 1), b = grid.At(n);
            Assert.True(b > a);
            Assert.True(b - a <= Math.Max(abs, rel * b) * (1 + 1e-12), $"gap {b - a} at {b}");
            Assert.Equal(n, grid.Ceiling(b));
            Assert.Equal(n, grid.Ceiling(0.5 * (a + b)));
            Assert.Equal(n - 1, grid.Floor(0.5 * (a + b)));
        }
    }
}
