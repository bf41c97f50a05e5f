namespace ExprModel.Core.Recordings;

/// <summary>The recorded sweep family of one cell, in sweep-number order, with what the reader noticed (missing sweeps, skipped series).</summary>
public sealed record RecordedCell
{
    public required string CellId { get; init; }
    /// <summary>The file (or files) the sweeps came from.</summary>
    public required string Source { get; init; }
    public required IReadOnlyList<RecordedSweep> Sweeps { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];

    /// <summary>Notes on gaps in the sweep numbering ("sweep 7 missing").</summary>
    public static IEnumerable<string> GapNotes(IReadOnlyList<RecordedSweep> ordered)
    {
        for (int i = 1; i < ordered.Count; i++)
        {
            int from = ordered[i - 1].SweepNumber + 1, to = ordered[i].SweepNumber - 1;
            if (to == from) yield return $"Sweep {from} is missing (numbers run {ordered[0].SweepNumber} to {ordered[^1].SweepNumber}).";
            else if (to > from) yield return $"Sweeps {from} to {to} are missing (numbers run {ordered[0].SweepNumber} to {ordered[^1].SweepNumber}).";
        }
    }
}
