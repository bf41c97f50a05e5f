using ExprModel.Core.Analysis;

namespace ExprModel.Core.Recordings;

/// <summary>
/// The read-outs of one recorded cell. <see cref="Readouts"/> holds them under the simulator's names and units
/// (<see cref="CellReadouts.Rows"/>), so recorded and predicted values line up; read-outs in current density stay
/// empty (a recording knows currents in pA, not the cell's area) and their absolute forms are filled. What only a
/// recorded family has (the step spacing that bounds the rheobase, the sweeps' own rates) is beside it.
/// </summary>
public sealed record RecordedReadouts
{
    public required string CellId { get; init; }
    public required string Source { get; init; }
    public required CellReadouts Readouts { get; init; }
    /// <summary>The rheobase is the smallest recorded step that spikes; the true value lies within this spacing below it (pA).</summary>
    public double? RheobaseStepSpacingPa { get; init; }
    public double? SustainedFiringOnsetPa { get; init; }
    public double? AdaptationStepPa { get; init; }
    /// <summary>Largest moving-average window used on any sweep (ms; 0 when every sweep was clean enough).</summary>
    public double SmoothingMs { get; init; }
    public IReadOnlyList<RecordedFiPoint> FiCurve { get; init; } = [];
    public IReadOnlyList<SweepAnalysis> Sweeps { get; init; } = [];
    public int SweepsUsed => Sweeps.Count(s => s.Excluded is null);

    /// <summary>The read-outs as rows: <see cref="CellReadouts.Rows"/> then the recording's own.</summary>
    public IEnumerable<(string Name, string Unit, double? Value)> Rows()
    {
        foreach (var row in Readouts.Rows()) yield return row;
        yield return ("rheobase_step_spacing", "pA", RheobaseStepSpacingPa);
        yield return ("sustained_firing_onset_absolute", "pA", SustainedFiringOnsetPa);
        yield return ("adaptation_step_absolute", "pA", AdaptationStepPa);
        yield return ("sweeps_used", "count", SweepsUsed);
        yield return ("smoothing_window", "ms", SmoothingMs);
    }
}
