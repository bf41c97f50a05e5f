using ExprModel.Core.Models;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using Microsoft.AspNetCore.Http.HttpResults;

namespace ExprModel.Web.Apis;

/// <summary>Simulation, f-I curves and read-outs of a model sent in the request (nothing is stored).</summary>
public static class SimulationApi
{
    public static IEndpointRouteBuilder MapSimulationApi(this IEndpointRouteBuilder app)
    {
        // A model request is kilobytes: its body and every text field in it are bounded before anything is simulated.
        var api = app.MapGroup("/api").WithTags("Simulation")
            .WithBodyLimit(BodyLimit.ModelRequest)
            .AddEndpointFilter<RequestFieldLimits>()
            .RequireRateLimiting(RateLimits.ExpensivePolicy);

        api.MapPost("/simulate", async Task<Ok<SimulateResponse>> (SimulateRequest request, ModelRunner runner, CancellationToken cancel) =>
            {
                var view = await runner.StepAsync(request.ReadModel(), request.Step ?? new StepProtocol(), cancel);
                return TypedResults.Ok(new SimulateResponse(view.FullTimeMs, view.FullVoltageMv, view.FullStimulusUaPerCm2, view.SpikeTimesMs,
                    ResearchCaution.Text));
            })
            .WithName("Simulate")
            .WithSummary("Runs one current-clamp step (amplitude in uA/cm2) and returns the voltage trace at every 25 us integration step and the spike times.")
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429).ProducesProblem(503);

        api.MapPost("/fi", async Task<Ok<FiResponse>> (FiRequest request, ModelRunner runner, CancellationToken cancel) =>
                TypedResults.Ok(new FiResponse(await runner.FiAsync(request.ReadModel(), request.Fi ?? new FiProtocol(), cancel), ResearchCaution.Text)))
            .WithName("FiCurve")
            .WithSummary("Measures the f-I curve (whole-step, first-ISI and late rates) over evenly spaced steps.")
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429).ProducesProblem(503);

        api.MapPost("/readouts", async Task<Ok<ReadoutsResponse>> (ReadoutsRequest request, ModelRunner runner, CancellationToken cancel) =>
            {
                var set = await runner.ReadoutsAsync(request.ReadModel(), cancel);
                return TypedResults.Ok(new ReadoutsResponse(set.Rows, set.Notes, ResearchCaution.Text));
            })
            .WithName("Readouts")
            .WithSummary("Measures every electrophysiology read-out of the model (resting potential, input resistance, rheobase, spike shape, class...).")
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429).ProducesProblem(503);
        return app;
    }
}
