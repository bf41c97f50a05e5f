using ExprModel.Core.Confrontation;
using ExprModel.Core.Models;
using ExprModel.Core.Perturbation;
using ExprModel.Core.Recordings;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using Microsoft.AspNetCore.Http.HttpResults;

namespace ExprModel.Web.Apis;

/// <summary>Knock-down, sensitivity and density fits of a model sent in the request (nothing is stored), within the simulation gate's limits.</summary>
public static class WhatIfApi
{
    public static IEndpointRouteBuilder MapWhatIfApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api/whatif").WithTags("What if")
            .AddEndpointFilter<RequestFieldLimits>()
            .RequireRateLimiting(RateLimits.ExpensivePolicy);

        api.MapPost("/knockdown", async Task<Ok<KnockdownResponse>> (KnockdownRequest request, ModelRunner runner, SimulationGate gate,
            CancellationToken cancel) =>
            {
                var doc = request.ReadModel();
                var cell = runner.Compile(doc).Model;
                if (request.Readout is { } r && ReadoutValues.UnitOf(r) is null) throw new UserInputException($"readout: '{r}' is not a read-out.");
                var report = await gate.RunAsync(token => Library(() =>
                {
                    var targets = request.Genes ? GeneKnockdowns.Targets(doc, cell, request.Level)
                        : KnockdownTarget.Channels(new DensityProbe(cell, Knockdown.DefaultSettings).ChannelLabels, request.Level);
                    return Knockdown.Run(cell, targets, request.Level, cancel: token);
                }), cancel);
                var rows = (request.Readout is { } name ? report.Ranked(name) : report.AllRanked())
                    .Select(c => new KnockdownRow(c.Readout, c.Unit, c.Target, c.Kind.ToString().ToLowerInvariant(), c.Intact, c.KnockedDown, c.Change,
                        c.RelativeChange, c.Lost)).ToArray();
                return TypedResults.Ok(new KnockdownResponse(report.Level, rows, report.Failures, ResearchCaution.Text));
            })
            .WithBodyLimit(BodyLimit.ModelRequest)
            .WithName("Knockdown")
            .WithSummary("Knocks down each channel entry (or each gene of a model built from expression) to a level and ranks every read-out's change "
                + "against the intact model.")
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429).ProducesProblem(503);

        api.MapPost("/sensitivity", async Task<Ok<SensitivityResponse>> (SensitivityRequest request, ModelRunner runner, SimulationGate gate,
            CancellationToken cancel) =>
            {
                var cell = runner.Compile(request.ReadModel()).Model;
                var settings = SensitivitySettings.Default with { StepLn = request.StepLn ?? SensitivitySettings.Default.StepLn };
                var m = await gate.RunAsync(token => Library(() => Sensitivity.Run(cell, settings, cancel: token)), cancel);
                return TypedResults.Ok(new SensitivityResponse(m.Channels, m.Columns.Select(c => c.Readout).ToArray(),
                    m.Columns.Select(c => c.EntryUnit).ToArray(),
                    m.Columns.Select(c => c.Kind == ElasticityKind.LogRatio ? "log-ratio" : "per-log-density").ToArray(),
                    m.Columns.Select(c => c.Quantisation).ToArray(),
                    m.Values, m.StepLn, m.Notes, ResearchCaution.Text));
            })
            .WithBodyLimit(BodyLimit.ModelRequest)
            .WithName("Sensitivity")
            .WithSummary("Sensitivity of every read-out to every channel density (central differences in ln density) as heat-map data; potentials are per "
                + "unit ln density, the rest log ratios.")
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429).ProducesProblem(503);

        api.MapPost("/fit", async Task<Ok<FitResponse>> (FitRequest request, ModelRunner runner, SimulationGate gate, CancellationToken cancel) =>
            {
                var doc = request.ReadModel();
                var cell = runner.Compile(doc).Model;
                bool fromRecorded = request.Recorded is not null || request.Recordings is { Count: > 0 };
                if (fromRecorded && request.Targets is { Count: > 0 })
                    throw new UserInputException("targets: give typed targets or recorded values (recorded, recordings), not both.");
                if (!fromRecorded && request.Targets is not { Count: > 0 })
                    throw new UserInputException("targets: give at least one {readout, value, unit?, scale?}, or recorded values (recorded or "
                        + "recordings) with cell or group.");
                var recorded = fromRecorded ? await gate.RunAsync(_ => RecordedTargetsOf(request, cell.Geometry.AreaUm2), cancel) : null;
                var targets = recorded?.Targets ?? Library(() => request.Targets!.Select((t, i) =>
                {
                    try { return FitTargetReader.ParseTyped(FormattableString.Invariant($"{t.Readout}={t.Value:R}{t.Unit}"), t.Scale); }
                    catch (ArgumentException e) { throw new ArgumentException($"targets[{i}]: {e.Message}"); }
                }).ToArray());
                var settings = FitSettings.Default with
                {
                    // Read-outs from sweeps are measured on the recorded step; the model is measured on the same.
                    Readouts = recorded?.StepDurationMs is { } stepMs ? FitSettings.Default.Readouts with { StepDurationMs = stepMs }
                        : FitSettings.Default.Readouts,
                    PriorWidth = request.NoPrior ? null : request.PriorWidth ?? FitSettings.Default.PriorWidth,
                    Starts = request.Starts,
                    Seed = request.Seed,
                    Optimiser = request.Optimiser switch
                    {
                        null or "lm" => FitOptimiser.LevenbergMarquardt,
                        "simplex" => FitOptimiser.Simplex,
                        var o => throw new UserInputException($"optimiser: '{o}' is not lm or simplex."),
                    },
                };
                var fit = await gate.RunAsync(token => Library(() => DensityFit.Run(doc, cell, targets, settings, cancel: token)), cancel);
                return TypedResults.Ok(new FitResponse(ModelRequest.ToElement(fit.Document), fit.Channels.Select(FitChannelRow.From).ToArray(),
                    fit.Residuals, fit.Identifiability.SingularValues, fit.Identifiability.Directions, fit.Identifiability.DirectionPinned,
                    fit.ObjectiveBefore, fit.ObjectiveAfter, fit.Evaluations, fit.Summary, ResearchCaution.Text)
                { TargetNotes = recorded?.Notes ?? [] });
            })
            // Recorded sweeps come inside the body (base64), so it takes the upload limit.
            .WithBodyLimit(BodyLimit.Upload)
            .WithName("FitDensities")
            .WithSummary("Fits relative densities to recorded read-outs under an expression prior; returns the fitted model, fold changes, residuals and "
                + "which densities the data pin down. "
                + "Targets are typed, or taken from a recorded-features table (recorded) or recorded sweeps (recordings, base64) for a cell or a group's mean.")
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429).ProducesProblem(503);
        return app;
    }

    /// <summary>
    /// Fit targets from the recorded table or sweeps of the request, for its cell or group (as <c>exprmodel fit
    /// --recorded|--recordings</c>).
    /// </summary>
    private static RecordedTargets RecordedTargetsOf(FitRequest request, double areaUm2)
    {
        if (request.Recorded is not null && request.Recordings is { Count: > 0 })
            throw new UserInputException("recorded, recordings: a fit takes one source of recorded values.");
        IReadOnlyList<RecordedReadouts> measured = [];
        RecordedFeatures features;
        if (request.Recordings is { Count: > 0 } files)
        {
            measured = RecordedUploads.Measure(files.Select((f, i) =>
            {
                try { return (f.Name, Convert.FromBase64String(f.ContentBase64)); }
                catch (FormatException) { throw new UserInputException($"recordings[{i}] ({f.Name}): contentBase64 is not valid base64."); }
            }).ToArray());
            features = Library(() => RecordedSweepFeatures.From(measured, string.Join(", ", files.Select(f => f.Name)), _ => true));
        }
        else features = RecordedUploads.Table(System.Text.Encoding.UTF8.GetBytes(request.Recorded!), request.RecordedName, null, null, _ => true);
        IReadOnlyList<string>? members = null;
        if (request.Group is { } group)
        {
            var metadata = request.Metadata ?? request.Recorded
                ?? throw new UserInputException("metadata: needed with group and recordings (the recordings carry no groups).");
            members = RecordedUploads.GroupMembers(System.Text.Encoding.UTF8.GetBytes(metadata), request.GroupBy, group);
        }
        return Library(() => RecordedFitTargets.For(features, measured, request.Cell, request.Group, members, areaUm2, request.FitReadouts));
    }

    /// <summary>The library's argument errors (bad targets, a model without a derivation) are the user's to fix: 400.</summary>
    private static T Library<T>(Func<T> work)
    {
        try
        {
            return work();
        }
        catch (ArgumentException e)
        {
            throw new UserInputException(e.Message);
        }
    }
}
