using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// Depolarisation block: the smallest step above the onset of sustained firing at which late firing stops (the
/// membrane sits depolarised with sodium channels inactivated).
/// </summary>
public static class DepolarisationBlock
{
    /// <summary>A step response is blocked when the second half of the step holds fewer than two spikes.</summary>
    public static bool IsBlocked(FiPoint response) => response.LateRateHz == 0;

    /// <summary>How far block is searched: <see cref="ReadoutSettings.BlockSearchMultiple"/> x rheobase (uA/cm2).</summary>
    public static double SearchLimitUaPerCm2(double rheobaseUaPerCm2, ReadoutSettings s) => rheobaseUaPerCm2 * s.BlockSearchMultiple;

    /// <summary>
    /// Searches block on <see cref="ReadoutSettings.StepDurationMs"/> steps above the onset of sustained firing, up to
    /// <paramref name="limitUaPerCm2"/> (<see cref="OnsetSearch"/> on the amplitude above the onset, 2 % and ten times the
    /// rheobase's absolute tolerance); null when firing continues up to the limit.
    /// </summary>
    internal static double? Find(CompiledCell cell, ReadoutSettings s, CellState rest, double sustainedOnsetUaPerCm2, double limitUaPerCm2,
        CancellationToken cancel)
    {
        double oc = sustainedOnsetUaPerCm2;
        var b = OnsetSearch.FindOnset(amps =>
        {
            var pts = FiCurve.Measure(cell, amps.Select(a => oc + a).ToArray(), s.StepDurationMs, rest, s.Simulation, cancel);
            return pts.Select(IsBlocked).ToArray();
        }, oc * 0.5, limitUaPerCm2 - oc, s.RheobaseAbsoluteToleranceUaPerCm2 * 10, 0.02, cancel);
        return b is null ? null : oc + b.AtOrAboveUaPerCm2;
    }
}
