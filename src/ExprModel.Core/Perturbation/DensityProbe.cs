using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// Measures a model with each channel's density multiplied by a factor: the one evaluation that knock-down,
/// sensitivity and fitting share. It calls the one feature extractor and runs its second stage (sag, f-I curve,
/// class, adaptation) only when <see cref="NeedsSecondStage"/> says a read-out of it is wanted.
/// Thread-safe: variants may be measured in parallel (rate tables are shared between cells with the same entries).
/// </summary>
public sealed class DensityProbe
{
    private int _evaluations;

    public DensityProbe(CellModel model, ReadoutSettings settings, bool needsSecondStage = true)
    {
        if (model.Problem() is { } p) throw new ModelException(p);
        Model = model;
        Settings = settings;
        NeedsSecondStage = needsSecondStage;
    }

    public CellModel Model { get; }
    public ReadoutSettings Settings { get; }
    public bool NeedsSecondStage { get; }
    public int ChannelCount => Model.Channels.Count;
    /// <summary>How many variants have been measured so far (for progress and the report).</summary>
    public int Evaluations => Volatile.Read(ref _evaluations);

    /// <summary>A probe that measures only the first stage unless one of <paramref name="readouts"/> needs the second.</summary>
    public static DensityProbe For(CellModel model, ReadoutSettings settings, IEnumerable<string> readouts) =>
        new(model, settings, readouts.Any(CellReadouts.SecondStageNames.Contains));

    /// <summary>Channel labels in model order: the entry id, with "#2", "#3" when an entry appears more than once.</summary>
    public IReadOnlyList<string> ChannelLabels
    {
        get
        {
            var seen = new Dictionary<string, int>(StringComparer.Ordinal);
            return Model.Channels.Select(c =>
            {
                int n = seen[c.Entry.Id] = seen.GetValueOrDefault(c.Entry.Id) + 1;
                return n == 1 ? c.Entry.Id : $"{c.Entry.Id}#{n}";
            }).ToArray();
        }
    }

    /// <summary>The model with channel k's relative density multiplied by <paramref name="factors"/>[k].</summary>
    public CellModel Scaled(IReadOnlyList<double> factors)
    {
        if (factors.Count != ChannelCount) throw new ArgumentException($"{factors.Count} density factors for {ChannelCount} channels.", nameof(factors));
        return Model with
        {
            Channels = Model.Channels.Select((c, k) => c with { RelativeDensity = c.RelativeDensity * factors[k] }).ToArray(),
        };
    }

    /// <summary>Measures the variant; a run that blows up or a model that cannot be built gives a failed result, not an exception.</summary>
    public ReadoutValues Measure(IReadOnlyList<double> factors, CancellationToken cancel = default)
    {
        try
        {
            var cell = new CompiledCell(Scaled(factors));
            var first = Features.MeasureFirst(cell, Settings, cancel);
            return ReadoutValues.From(NeedsSecondStage ? Features.Complete(cell, first, Settings, cancel) : first);
        }
        catch (Exception e) when (e is SimulationBlowUpException or ModelException)
        {
            return ReadoutValues.Failed(e.Message);
        }
        finally
        {
            Interlocked.Increment(ref _evaluations);
        }
    }

    /// <summary>The intact model's read-outs (every factor 1).</summary>
    public ReadoutValues MeasureIntact(CancellationToken cancel = default) => Measure(Enumerable.Repeat(1.0, ChannelCount).ToArray(), cancel);
}
