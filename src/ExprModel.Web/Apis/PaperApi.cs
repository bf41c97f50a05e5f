using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Data.Store;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.AspNetCore.Http.HttpResults;

namespace ExprModel.Web.Apis;

/// <summary>Adaptation mechanisms of a model, and the paper-ready methods paragraph with the BibTeX of its sources.</summary>
public static class PaperApi
{
    public static IEndpointRouteBuilder MapPaperApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api").WithTags("Paper");

        api.MapPost("/mechanisms", async Task<ContentHttpResult> (MechanismsRequest request, ModelRunner runner, CancellationToken cancel) =>
            {
                var doc = request.ReadModel();
                var (report, geometry) = await runner.MechanismsAsync(doc, request.AmplitudeUaPerCm2, request.ProbeDelayMs, cancel);
                if (request.Format == "csv") return TypedResults.Text(MechanismCsv.Write(doc.Name, report, CurrentUnit.UaPerCm2, geometry), "text/csv");
                return TypedResults.Text(MechanismCsv.Json(doc.Name, report, CurrentUnit.UaPerCm2, geometry).ToJsonString(), "application/json");
            })
            .WithName("Mechanisms")
            .WithSummary("Adaptation mechanisms on a suprathreshold step (default twice the rheobase, amplitude in uA/cm2): threshold and " +
                "after-hyperpolarisation per spike, each channel's inter-spike current, pulse threshold after one spike and after the train.")
            .ProducesProblem(400).ProducesProblem(503);

        api.MapPost("/methods", Ok<MethodsResponse> (MethodsRequest request, ModelRunner runner) =>
            {
                var (paragraph, bib) = runner.Methods(request.ReadModel());
                return TypedResults.Ok(new MethodsResponse(paragraph, bib, ResearchCaution.Text));
            })
            .WithName("Methods")
            .WithSummary("A methods paragraph for the model (channels with citations and densities, temperature and Q10, integration, " +
                "protocols, read-out definitions, versions) and the BibTeX file of every cited source.")
            .ProducesProblem(400);

        api.MapGet("/models/{id}/methods", Results<Ok<MethodsResponse>, NotFound> (string id, SnapshotService snapshots, ModelRunner runner) =>
            {
                var snap = SnapshotStore.IsWellFormedId(id) ? snapshots.Store.Find(id) : null;
                if (snap is null) return TypedResults.NotFound();
                var (paragraph, bib) = runner.Methods(ModelRunner.Parse(snap.ModelJson, $"snapshot {id}"));
                return TypedResults.Ok(new MethodsResponse(paragraph, bib, ResearchCaution.Text));
            })
            .WithName("SharedModelMethods")
            .WithSummary("The methods paragraph and BibTeX of a shared model (by its link id).");
        return app;
    }
}
