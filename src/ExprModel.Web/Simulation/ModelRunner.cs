using ExprModel.Core.Analysis;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Core.Stochastic;
using ExprModel.Data.Catalog;

namespace ExprModel.Web.Simulation;

/// <summary>
/// What the pages and the HTTP API run: a model document and a protocol in, plot-ready views out. All science is the
/// library's (<see cref="Simulator"/>, the read-out and f-I facades); this class only compiles, bounds and shapes.
/// </summary>
public sealed class ModelRunner(ChannelCatalog catalog, SimulationGate gate)
{
    /// <summary>Buckets per plotted voltage trace (each keeps its min and max, so spike peaks survive): about two per pixel of
    /// the Workbench plot and of its PNG export. The CSV export has every sample.</summary>
    public const int PlotBuckets = 700;

    public ChannelCatalog Catalog => catalog;

    /// <summary>
    /// Resolves the document's entries and compiles the cell; user errors come back as <see cref="UserInputException"/>.
    /// A document that differs from a recent one only in densities (a relative-density move) reuses its kinetics.
    /// </summary>
    public CompiledCell Compile(ModelDocument doc)
    {
        try
        {
            return _kinetics.Compile(doc.ToCellModel(catalog.Resolve));
        }
        catch (Exception e) when (e is CatalogException or ModelFileException or ModelException or ArgumentException)
        {
            throw new UserInputException(e.Message);
        }
    }

    /// <summary>Parses a model file's text, naming <paramref name="where"/> in errors.</summary>
    public static ModelDocument Parse(string json, string where)
    {
        try
        {
            return ModelDocument.Parse(json, where);
        }
        catch (ModelFileException e)
        {
            throw new UserInputException(e.Message);
        }
    }

    /// <summary>The document with every entry pinned to the catalog version it resolves to today.</summary>
    public ModelDocument Pin(ModelDocument doc)
    {
        try
        {
            return doc.Pinned(catalog.Resolve);
        }
        catch (CatalogException e)
        {
            throw new UserInputException(e.Message);
        }
    }

    public Task<StepView> StepAsync(ModelDocument doc, StepProtocol step, CancellationToken cancel)
    {
        if (step.Problem() is { } p) throw new UserInputException(p);
        var cell = Compile(doc);
        return gate.RunAsync(token => step.ChannelNoise ? NoisyStep(cell, step, token) : Step(cell, step, token), cancel);
    }

    /// <summary>The step with stochastic channels: counts from density x area / the catalog's unitary conductance.</summary>
    public StepView NoisyStep(CompiledCell cell, StepProtocol step, CancellationToken cancel)
    {
        var stimulus = new StepCurrent(step.DelayMs, step.StepMs, step.AmplitudeUaPerCm2);
        var settings = new ChannelNoiseSettings
        {
            UnitaryConductancesPs = ChannelNoise.UnitaryConductances(cell.Model, e => catalog.UnitaryConductances.For(e).ConductancePs),
            Seed = step.NoiseSeed,
            RecordEvery = 1,
        };
        try
        {
            return StepView.FromNoisy(ChannelNoise.Run(cell, stimulus, step.TotalMs, settings, cancel), step, stimulus);
        }
        catch (SimulationBlowUpException e)
        {
            throw new UserInputException(e.Message);
        }
    }


    /// <summary>A stochastic patch simulation (<see cref="PatchClamp"/>) in one simulation slot.</summary>
    public Task<PatchResult> PatchAsync(PatchSettings settings, CancellationToken cancel)
    {
        if (settings.Problem() is { } p) throw new UserInputException(p);
        return gate.RunAsync(token => PatchClamp.Run(settings, token), cancel);
    }

    public Task<IReadOnlyList<FiRow>> FiAsync(ModelDocument doc, FiProtocol fi, CancellationToken cancel)
    {
        if (fi.Problem() is { } p) throw new UserInputException(p);
        var cell = Compile(doc);
        return gate.RunAsync(token => Fi(cell, fi, token), cancel);
    }

    /// <summary>
    /// Read-outs of a model. Results are kept for the last <see cref="CacheSize"/> distinct cells (keyed by what the cell
    /// simulates, <see cref="CompiledCell.Key"/>: its kinetics and densities): returning to an earlier slider position or
    /// to 100% is immediate.
    /// </summary>
    /// <remarks>Only the Workbench's live loop uses the cache; the API and the shared-model check always measure afresh.</remarks>
    public async Task<ReadoutSet> ReadoutsAsync(ModelDocument doc, CancellationToken cancel, bool useCache = false)
    {
        var cell = Compile(doc);
        if (useCache && _cache.TryGetValue(cell.Key, out var hit)) return hit;
        var set = await gate.RunAsync(token => Readouts(cell, token), cancel);
        Remember(cell.Key, set);
        return set;
    }

    /// <summary>
    /// The Workbench's live read-outs, first stage: rest, passive properties, sag, rheobase and the spike at rheobase
    /// (the rest are marked pending). <paramref name="rheobaseHint"/> (the previous model's <see cref="ReadoutSet.Hint"/>) seeds
    /// the search; the answer is the same grid point a cold search finds. A model already measured in full comes back complete.
    /// </summary>
    public async Task<ReadoutSet> FirstReadoutsAsync(ModelDocument doc, RheobaseHint? rheobaseHint, CancellationToken cancel)
    {
        var cell = Compile(doc);
        if (_cache.TryGetValue(cell.Key, out var hit)) return hit;
        return await gate.RunAsync(token =>
        {
            var first = Guard(() => Features.MeasureFirst(cell, ReadoutSettings.Live, token, rheobaseHint));
            return ToSet(first) with { Continuation = (cell, first) };
        }, cancel);
    }

    /// <summary>The second stage of <see cref="FirstReadoutsAsync"/>: the f-I curve, class, adaptation; the result is cached.</summary>
    public async Task<ReadoutSet> CompleteReadoutsAsync(ModelDocument doc, ReadoutSet first, CancellationToken cancel)
    {
        if (first.IsComplete || first.Continuation is not { } c) return first;
        var set = await gate.RunAsync(token => ToSet(Guard(() => Features.Complete(c.Cell, c.Stage, ReadoutSettings.Live, token))), cancel);
        Remember(c.Cell.Key, set);
        return set;
    }

    /// <summary>
    /// Keeps a complete, unseeded measurement of <paramref name="doc"/> (the one a share link stored) as the live loop's
    /// answer for that model, so returning to the same slider position shows it rather than a seeded search's.
    /// </summary>
    public void Adopt(ModelDocument doc, ReadoutSet set)
    {
        if (set.IsComplete) Remember(Compile(doc).Key, set);
    }

    /// <summary>Cells per request of a per-cell batch: each chunk is one bounded request (time cap, a gate slot).</summary>
    public const int CellBatchChunk = 8;

    /// <summary>
    /// The batch read-outs (the library's <see cref="BatchReadouts"/>, as `exprmodel batch --per cell`) for every cell of
    /// a dataset, in chunks of <see cref="CellBatchChunk"/> cells so each chunk stays under the per-request time cap and
    /// the job can be cancelled between and within chunks. <paramref name="progress"/> gets the number of cells done.
    /// </summary>
    /// <param name="chunkDone">Gets each chunk's rows as soon as they are measured, so a cancelled job keeps what it has.</param>
    /// <param name="shrinkage">Per-cell expression estimates (<see cref="ExpressionDataset.Shrink"/>); null builds each cell from its raw values.</param>
    public async Task<int> CellBatchAsync(ExpressionDataset data, MappingReport report, DensityRule rule, Action<int> progress, CancellationToken cancel,
        Action<IReadOnlyList<BatchRow>> chunkDone, PerCellShrinkage? shrinkage = null)
    {
        var targets = data.CellTargets;
        int done = 0;
        for (int from = 0; from < targets.Count; from += CellBatchChunk)
        {
            int start = from, to = Math.Min(targets.Count, from + CellBatchChunk);
            var rows = await gate.RunAsync(
                token => BatchReadouts.Run(data.Table, report, data.Catalog, rule, targets, data.Groups, start, to, null, token, shrinkage), cancel);
            chunkDone(rows);
            done += rows.Count;
            progress(done);
        }
        return done;
    }

    private void Remember(CellKey key, ReadoutSet set)
    {
        if (_cache.Count >= CacheSize) _cache.Clear();
        _cache[key] = set;
    }

    public const int CacheSize = 512;
    private readonly System.Collections.Concurrent.ConcurrentDictionary<CellKey, ReadoutSet> _cache = new();
    private readonly KineticsCache _kinetics = new();

    /// <summary>Kinetics compiled so far: a relative-density move adds none (test hook).</summary>
    internal int KineticsBuilt => _kinetics.KineticsBuilt;

    /// <summary>
    /// The adaptation-mechanism protocol (<see cref="AdaptationMechanisms"/>) on a step of <paramref name="stepUaPerCm2"/> (null: twice
    /// the rheobase), with the cell's geometry for absolute units.
    /// </summary>
    public Task<(MechanismReport Report, ExprModel.Core.Cell.Geometry Geometry)> MechanismsAsync(ModelDocument doc, double? stepUaPerCm2,
        double? probeDelayMs, CancellationToken cancel)
    {
        var settings = MechanismSettings.Default with { ProbeDelayMs = probeDelayMs ?? MechanismSettings.Default.ProbeDelayMs };
        if (settings.Problem() is { } p) throw new UserInputException(p);
        if (stepUaPerCm2 is { } a && !(a > 0 && a <= 1000)) throw new UserInputException($"amplitudeUaPerCm2 must lie in (0, 1000] (got {a}).");
        var cell = Compile(doc);
        return gate.RunAsync(token =>
        {
            try
            {
                return (AdaptationMechanisms.Measure(cell, stepUaPerCm2, settings, token), cell.Model.Geometry);
            }
            catch (Exception e) when (e is ArgumentException or SimulationBlowUpException)
            {
                throw new UserInputException(e.Message);
            }
        }, cancel);
    }

    /// <summary>The methods paragraph (with the live read-out settings the pages use) and the BibTeX file of a model.</summary>
    public (string Paragraph, string BibTex) Methods(ModelDocument doc)
    {
        var model = Compile(doc).Model;
        var versions = ExprModel.Core.Export.MethodsVersions.Current(catalog.VersionLabel);
        var (entries, _) = ExprModel.Core.Export.BibTex.For(model, doc.Citation, versions);
        return (ExprModel.Core.Export.MethodsText.Write(doc, model, versions, ReadoutSettings.Live),
            ExprModel.Core.Export.BibTex.Write(entries, ResearchCaution.Text));
    }

    /// <summary>The trace of one step with channel currents, shaped for the plots.</summary>
    public static StepView Step(CompiledCell cell, StepProtocol step, CancellationToken cancel)
    {
        try
        {
            var recording = StepRecording.Run(cell, new StepCurrent(step.DelayMs, step.StepMs, step.AmplitudeUaPerCm2), step.TotalMs, cancel);
            return StepView.From(recording, step);
        }
        catch (SimulationBlowUpException e)
        {
            throw new UserInputException(e.Message);
        }
    }

    public static IReadOnlyList<FiRow> Fi(CompiledCell cell, FiProtocol fi, CancellationToken cancel) =>
        FiCurve.Measure(cell, fi.FromUaPerCm2, fi.ToUaPerCm2, fi.Steps, fi.DurationMs, null, null, cancel)
            .Select(p => new FiRow(p.CurrentUaPerCm2, p.SpikesInStep, p.WholeStepRateHz, p.FirstIsiRateHz, p.LateRateHz)).ToArray();

    /// <summary>Every read-out of the library's one feature extractor, as table rows.</summary>
    // Live settings (2 % tolerances, no block search) keep slider updates quick; `exprmodel features` runs the full set.
    public static ReadoutSet Readouts(CompiledCell cell, CancellationToken cancel) => ToSet(Guard(() => Features.Measure(cell, ReadoutSettings.Live, cancel)));

    private static CellReadouts Guard(Func<CellReadouts> measure)
    {
        try
        {
            return measure();
        }
        catch (SimulationBlowUpException e)
        {
            throw new UserInputException(e.Message);
        }
    }

    private static ReadoutSet ToSet(CellReadouts r) =>
        new(r.Rows().Select(x => new ReadoutRow(x.Name, x.Unit, x.Value)).ToArray(), r.Notes)
        {
            Fi = r.FiCurve.Select(p => new FiRow(p.CurrentUaPerCm2, p.SpikesInStep, p.WholeStepRateHz, p.FirstIsiRateHz, p.LateRateHz)).ToArray(),
            Pending = r.IsComplete ? new HashSet<string>() : CellReadouts.SecondStageNames,
            Hint = r.Hint,
            SpikingNotMonotone = r.SpikingNotMonotone,
        };
}
