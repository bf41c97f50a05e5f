using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// Virtual knock-down: each target (a channel entry, or a gene of a model built from expression) reduced to a level
/// (0 = removed, 0.5 = half), the model measured with the one feature extractor, and every read-out compared with
/// the intact model. Targets run in parallel.
/// </summary>
public static class Knockdown
{
    /// <summary>
    /// Read-out settings for knock-downs: the live settings (2 % rheobase grid, no depolarisation-block search). A
    /// knock-down to half or nothing moves the read-outs by far more than that grid.
    /// </summary>
    public static ReadoutSettings DefaultSettings => ReadoutSettings.Live;

    /// <param name="progress">Called with (targets done, targets in all) as each finishes.</param>
    public static KnockdownReport Run(CellModel model, IReadOnlyList<KnockdownTarget> targets, double level, ReadoutSettings? settings = null,
        Action<int, int>? progress = null, CancellationToken cancel = default)
    {
        if (!(level >= 0) || double.IsInfinity(level)) throw new ArgumentException($"knock-down level must be a number >= 0 (got {level}).", nameof(level));
        var probe = new DensityProbe(model, settings ?? DefaultSettings);
        var intact = probe.MeasureIntact(cancel);
        if (intact.Failure is { } f) throw new ArgumentException("The intact model cannot be measured: " + f);
        var results = new ReadoutValues[targets.Count];
        int done = 0;
        Simulator.ForEachItem(targets.Count, cancel, i =>
        {
            results[i] = probe.Measure(targets[i].Factors, cancel);
            progress?.Invoke(Interlocked.Increment(ref done), targets.Count);
        });
        var changes = new List<KnockdownChange>();
        var failures = new Dictionary<string, string>(StringComparer.Ordinal);
        for (int i = 0; i < targets.Count; i++)
        {
            if (results[i].Failure is { } why) failures[targets[i].Name] = why;
            foreach (var (name, unit) in ReadoutValues.Names)
                changes.Add(new KnockdownChange(targets[i].Name, targets[i].Kind, name, unit, intact[name], results[i][name]));
        }
        return new KnockdownReport(level, intact, changes, failures);
    }
}
