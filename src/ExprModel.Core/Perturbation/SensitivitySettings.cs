using ExprModel.Core.Analysis;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// How the sensitivity matrix is measured: central differences at ln(density) +- <see cref="StepLn"/>, with the
/// read-out settings given. Rheobase and sustained onset are searched on a grid (relative step = their tolerance):
/// a difference quotient only resolves elasticities above grid step / (2 x step), so the default tightens the grids to
/// 0.5 % and 1 % and steps by ln 1.2 (+-20 %): a rheobase elasticity of 0.1 then moves the answer across about seven
/// grid points, and the quantisation limit is about 0.014.
/// </summary>
public sealed record SensitivitySettings
{
    public double StepLn { get; init; } = Math.Log(1.2);
    public ReadoutSettings Readouts { get; init; } = TightReadouts;

    /// <summary>The live settings with the rheobase grid at 0.5 % and the sustained-onset grid at 1 %.</summary>
    public static ReadoutSettings TightReadouts { get; } = ReadoutSettings.Live with
    {
        RheobaseRelativeTolerance = 0.005,
        RheobaseAbsoluteToleranceUaPerCm2 = 0.001,
        ClassRelativeTolerance = 0.01,
    };

    public static SensitivitySettings Default { get; } = new();

    public string? Problem() => StepLn is > 0 and <= 1 ? null : $"stepLn must lie in (0, 1] (got {StepLn})";

    /// <summary>The smallest elasticity a read-out on a grid resolves with these settings, null for continuous ones.</summary>
    public double? Resolution(string readout) =>
        ReadoutScales.RelativeGridStep(readout, Readouts) is { } g ? Math.Log(1 + g) / (2 * StepLn) : null;
}
