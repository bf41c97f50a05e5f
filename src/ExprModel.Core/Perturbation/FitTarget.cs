namespace ExprModel.Core.Perturbation;

/// <summary>
/// One recorded read-out a fit aims at: its name (as in the read-out table), value in the read-out's unit, and the
/// misfit scale (same unit) that one unit of squared error stands for: the group's recorded spread or a stated tolerance.
/// </summary>
public sealed record FitTarget(string Readout, double Value, double Scale)
{
    public string Unit => ReadoutValues.UnitOf(Readout) ?? "";

    /// <summary>A target with the default scale for its read-out (<see cref="ReadoutScales.DefaultFitScale"/>).</summary>
    public static FitTarget WithDefaultScale(string readout, double value) =>
        new(readout, value, ReadoutScales.DefaultFitScale(readout, ReadoutValues.UnitOf(readout) ?? "", value));
}
