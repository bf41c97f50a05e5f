namespace ExprModel.Core.Perturbation;

/// <summary>
/// Every target's effect on every read-out at one knock-down level. <see cref="Ranked"/> answers "which genes or
/// entries set read-out X": the targets ordered by how far they move X (a lost read-out first, then |relative change|).
/// </summary>
public sealed record KnockdownReport(double Level, ReadoutValues Intact, IReadOnlyList<KnockdownChange> Changes, IReadOnlyDictionary<string, string> Failures)
{
    /// <summary>The changes of one read-out, largest effect first.</summary>
    public IReadOnlyList<KnockdownChange> Ranked(string readout) => Changes
        .Where(c => c.Readout == readout)
        .OrderByDescending(c => c.Lost || c.Gained)
        .ThenByDescending(c => Math.Abs(c.RelativeChange ?? c.Change ?? 0))
        .ThenBy(c => c.Target, StringComparer.Ordinal)
        .ToArray();

    /// <summary>Every change, grouped by read-out (extractor order) and ranked within each.</summary>
    public IReadOnlyList<KnockdownChange> AllRanked() => ReadoutValues.Names.SelectMany(n => Ranked(n.Name)).ToArray();
}
