using ExprModel.Core.Stochastic;
using ExprModel.Web.Simulation;
using Microsoft.AspNetCore.Http.HttpResults;

namespace ExprModel.Web.Apis;

/// <summary>Stochastic patch simulation of one catalog entry (nothing is stored).</summary>
public static class PatchApi
{
    public static IEndpointRouteBuilder MapPatchApi(this IEndpointRouteBuilder app)
    {
        app.MapPost("/api/patch", async Task<Ok<PatchResponse>> (PatchRequest request, ModelRunner runner, CancellationToken cancel) =>
            {
                var (settings, unitary) = request.ToSettings(runner.Catalog);
                var result = await runner.PatchAsync(settings, cancel);
                return TypedResults.Ok(PatchResponse.From(result, unitary));
            })
            .WithTags("Stochastic")
            .WithName("Patch")
            .WithSummary("Simulates N channels of one catalog entry under a voltage step exactly (Gillespie): single sweeps, ensemble mean " +
                "against the deterministic current, dwell-time histograms with theory, open probability and the variance-mean fit.")
            .ProducesProblem(400).ProducesProblem(503);
        return app;
    }
}
