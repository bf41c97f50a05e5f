namespace ExprModel.Core.Analysis;

/// <summary>A step amplitude sized to a cell: twice its rheobase, rounded up to a value a person would type.</summary>
public static class StepSizing
{
    /// <summary>
    /// Twice <paramref name="rheobaseUaPerCm2"/>, rounded up to two significant figures: far enough above rheobase that
    /// the step fires repetitively in a regular-spiking cell (common practice), and a round number; 1 without a positive rheobase.
    /// </summary>
    public static double FromRheobase(double rheobaseUaPerCm2) => RoundUpToTwoSignificantFigures(2 * rheobaseUaPerCm2);

    /// <summary>The smallest number with two significant figures at or above <paramref name="x"/> (1 for anything not positive).</summary>
    public static double RoundUpToTwoSignificantFigures(double x)
    {
        if (!(x > 0)) return 1;
        double scale = Math.Pow(10, Math.Floor(Math.Log10(x)) - 1);
        return Math.Ceiling(x / scale) * scale;
    }
}
