using ExprModel.Core.Perturbation;
using ExprModel.Core.Recordings;

namespace ExprModel.Core.Confrontation;

/// <summary>
/// Turns recorded values (a recorded-features table or read-outs measured from sweeps, as <see cref="RecordedFeatures"/>)
/// into fit targets for one cell or one group. A group's target is its recorded mean, scaled by its recorded SD
/// (DOMAIN.md, "Fitting under an expression prior"), or by the read-out's default scale
/// (<see cref="ReadoutScales.DefaultFitScale"/>) with fewer than <see cref="AgreementStatistics.MinimumCells"/> cells.
/// </summary>
public static class RecordedFitTargets
{
    /// <summary>
    /// Read-outs fitted by default: those whose recorded definition is the model's. Left out unless asked for: latency
    /// (read on a step up to one spacing above rheobase), onset rate, class and adaptation (read on the lab's family
    /// steps, not the model's searched ones), the maximal rise rate (set by the sampling rate and the smoothing a noisy
    /// recording needs: a 0.15 ms moving average lowers a fast upstroke's slope), and discrete flags.
    /// </summary>
    public static IReadOnlyList<string> DefaultReadouts { get; } =
    [
        "resting_potential", "input_resistance", "membrane_time_constant", "sag_ratio", "rheobase", "rheobase_absolute", "spike_threshold", "spike_peak",
        "spike_amplitude", "spike_half_width", "after_hyperpolarisation", "fi_gain", "fi_gain_absolute",
    ];

    /// <summary>
    /// Smallest scale of a recorded sag ratio (our setting): a cell without sag records a ratio of noise over the step's
    /// deflection (0.15 mV rms on 20 mV is under 0.01), so a relative scale of 5 % of such a value would let noise rule
    /// the fit.
    /// </summary>
    public const double MinimumSagScale = 0.02;

    /// <summary>
    /// Targets for one cell (<paramref name="cellId"/>) or one group's mean (<paramref name="group"/> with its
    /// <paramref name="groupMembers"/>), exactly one of the two. With read-outs measured from sweeps
    /// (<paramref name="measured"/>), the cell's rheobase step spacing and the sweeps' step duration are used.
    /// </summary>
    public static RecordedTargets For(RecordedFeatures recorded, IReadOnlyList<RecordedReadouts> measured, string? cellId, string? group,
        IReadOnlyCollection<string>? groupMembers, double? areaUm2, IReadOnlyCollection<string>? readouts = null)
    {
        if ((cellId is null) == (group is null)) throw new ArgumentException("Give a cell or a group to fit (one of the two).");
        if (cellId is not null)
        {
            var own = measured.Where(m => m.CellId == cellId).ToArray();
            var t = ForCell(recorded, cellId, areaUm2, own.FirstOrDefault()?.RheobaseStepSpacingPa, readouts);
            return t with { StepDurationMs = StepDurationMs(own) };
        }
        if (groupMembers is not { Count: > 0 }) throw new ArgumentException($"group '{group}': no member cells.");
        var g = ForGroup(recorded, group!, groupMembers, areaUm2, readouts);
        return g with { StepDurationMs = StepDurationMs(measured.Where(m => groupMembers.Contains(m.CellId))) };
    }

    /// <summary>One cell's recorded values as targets, each with the read-out's default scale.</summary>
    /// <param name="areaUm2">The model's membrane area, to convert a current recorded per area (or the reverse) to the read-out's unit.</param>
    /// <param name="rheobaseStepSpacingPa">The recorded family's step spacing below the rheobase step (from sweeps): the true
    /// rheobase lies in the spacing below the smallest spiking step, so the target is the spacing's midpoint and its
    /// scale at least the SD of a value uniform over it (spacing / sqrt 12).</param>
    /// <param name="readouts">Read-outs to use (default <see cref="DefaultReadouts"/>).</param>
    public static RecordedTargets ForCell(RecordedFeatures recorded, string cellId, double? areaUm2, double? rheobaseStepSpacingPa = null,
        IReadOnlyCollection<string>? readouts = null)
    {
        if (!recorded.RecordedCells.Contains(cellId))
            throw new ArgumentException($"{recorded.Source}: no recorded values for cell '{cellId}' (recorded cells: " +
                $"{string.Join(", ", recorded.RecordedCells.Take(20))}{(recorded.RecordedCells.Count > 20 ? ", ..." : "")}).");
        var targets = new List<FitTarget>();
        var notes = new List<string>();
        foreach (var r in Chosen(recorded, readouts, notes))
        {
            if (!r.ValueByCell.TryGetValue(cellId, out var raw)) continue;
            if (Convert(r, raw, areaUm2, notes) is not { } v) continue;
            var t = Floored(FitTarget.WithDefaultScale(r.Readout, v));
            if (r.Readout == "rheobase_absolute" && rheobaseStepSpacingPa is > 0 and var spacing)
            {
                t = new FitTarget(r.Readout, v - spacing / 2, Math.Max(t.Scale, spacing / Math.Sqrt(12)));
                notes.Add(FormattableString.Invariant($"rheobase_absolute: the smallest spiking step is {v:G4} pA and the step below it {v - spacing:G4} ") +
                    FormattableString.Invariant($"pA; target the midpoint {t.Value:G4} pA, scale {t.Scale:G3} pA."));
            }
            targets.Add(t);
        }
        if (targets.Count == 0) throw new ArgumentException($"{recorded.Source}: cell '{cellId}' has no recorded value of a read-out that can be fitted.");
        notes.Add($"cell {cellId}: {targets.Count} target(s), each with the read-out's default scale (1 mV for potentials, 5 % otherwise; sag ratio at least " +
            $"{MinimumSagScale}).");
        return new RecordedTargets(targets, notes);
    }

    /// <summary>A group's recorded mean per read-out, scaled by its recorded SD (default scale below 3 cells).</summary>
    public static RecordedTargets ForGroup(RecordedFeatures recorded, string group, IReadOnlyCollection<string> members, double? areaUm2,
        IReadOnlyCollection<string>? readouts = null)
    {
        var targets = new List<FitTarget>();
        var notes = new List<string>();
        var inGroup = members.ToHashSet(StringComparer.Ordinal);
        foreach (var r in Chosen(recorded, readouts, notes))
        {
            var values = r.ValueByCell.Where(p => inGroup.Contains(p.Key)).OrderBy(p => p.Key, StringComparer.Ordinal)
                .Select(p => Convert(r, p.Value, areaUm2, notes)).OfType<double>().ToArray();
            if (values.Length == 0) continue;
            double mean = values.Average();
            var t = Floored(FitTarget.WithDefaultScale(r.Readout, mean));
            if (AgreementStatistics.SpreadOf(values) is > 0 and var sd)
            {
                t = t with { Scale = sd };
                notes.Add(FormattableString.Invariant($"{r.Readout}: mean of {values.Length} cells {mean:G4} {t.Unit}, scale their SD {sd:G3}."));
            }
            else notes.Add(FormattableString.Invariant($"{r.Readout}: mean of {values.Length} cell(s) {mean:G4} {t.Unit}; fewer than ") +
                FormattableString.Invariant($"{AgreementStatistics.MinimumCells} (or no spread), so the default scale {t.Scale:G3}."));
            targets.Add(t);
        }
        if (targets.Count == 0) throw new ArgumentException($"{recorded.Source}: no cell of group '{group}' has a recorded value of a read-out that can be " +
            "fitted.");
        return new RecordedTargets(targets, notes);
    }

    /// <summary>Read-outs measured from sweeps keep the sweeps' step duration, so a fit can measure its model on the same step.</summary>
    public static double? StepDurationMs(IEnumerable<RecordedReadouts> measured)
    {
        var durations = measured.SelectMany(m => m.Sweeps).Where(s => s.Excluded is null && s.Step is not null)
            .Select(s => Math.Round(s.Step!.DurationMs)).Distinct().ToArray();
        return durations.Length == 1 ? durations[0] : null;
    }

    private static IEnumerable<RecordedReadout> Chosen(RecordedFeatures recorded, IReadOnlyCollection<string>? readouts, List<string> notes)
    {
        var wanted = readouts ?? DefaultReadouts;
        foreach (var name in wanted)
            if (ReadoutValues.UnitOf(name) is null) throw new ArgumentException($"'{name}' is not a read-out (read-outs: " +
                $"{string.Join(", ", ReadoutValues.Names.Select(n => n.Name))}).");
        foreach (var r in recorded.Readouts)
        {
            if (!wanted.Contains(r.Readout))
            {
                notes.Add($"{r.Readout}: recorded but not fitted " +
                    $"({(ReadoutScales.KindOf(r.Readout) == ElasticityKind.None ? "discrete" : "not among the read-outs chosen")}).");
                continue;
            }
            if (ReadoutScales.KindOf(r.Readout) == ElasticityKind.None) throw new ArgumentException($"'{r.Readout}' is discrete and cannot be fitted.");
            yield return r;
        }
    }

    private static FitTarget Floored(FitTarget t) => t.Readout == "sag_ratio" && t.Scale < MinimumSagScale ? t with { Scale = MinimumSagScale } : t;

    private static double? Convert(RecordedReadout r, double raw, double? areaUm2, List<string> notes)
    {
        try { return r.InReadoutUnit(raw, areaUm2); }
        catch (ArgumentException e)
        {
            notes.Add($"{r.Readout}: {e.Message}");
            return null;
        }
    }
}
