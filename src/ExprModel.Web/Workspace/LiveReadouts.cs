using ExprModel.Core.Analysis;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// The Workbench's read-out table as shown: the latest rows (a first stage marks the rest pending), the extractor's
/// notes, how often the table changed, and where the next rheobase search starts (the library's hint rule).
/// </summary>
public sealed class LiveReadouts
{
    private readonly RheobaseHintTrail _hints = new();

    public IReadOnlyList<ReadoutRow>? Rows { get; private set; }
    public IReadOnlySet<string> Pending { get; private set; } = new HashSet<string>();
    public IReadOnlyList<string> Notes { get; private set; } = [];
    /// <summary>Times the table was shown, and shown complete (the page carries both; tests wait on them).</summary>
    public int UpdateCount { get; private set; }
    public int CompleteCount { get; private set; }
    public bool IsComplete => Rows is not null && Pending.Count == 0;

    /// <summary>Where the next model's rheobase search starts; null means from scratch.</summary>
    public RheobaseHint? Hint => _hints.Current;

    public void Show(ReadoutSet set)
    {
        Rows = set.Rows;
        Pending = set.Pending;
        Notes = set.Notes;
        _hints.Observe(set.Hint, set.SpikingNotMonotone);
        UpdateCount++;
        if (set.IsComplete) CompleteCount++;
    }

    /// <summary>A newly opened model is measured from scratch, as a share link or the API measure it.</summary>
    public void ForgetHint() => _hints.Forget();
}
