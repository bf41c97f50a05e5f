using System.Text;
using System.Text.Json;
using ExprModel.Core.Models;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Apis;

/// <summary>Shared snapshots: store a model under an unguessable id and read it back.</summary>
public static class ModelsApi
{
    public static IEndpointRouteBuilder MapModelsApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api/models").WithTags("Shared models");

        api.MapPost("/",
            async Task<Created<SavedModelResponse>> (SaveModelRequest request, SnapshotService snapshots, HttpContext http, IOptions<WebOptions> options,
                CancellationToken cancel) =>
            {
                var model = request.ReadModel();
                byte[]? expression = request.Expression is null ? null : Encoding.UTF8.GetBytes(request.Expression);
                var (snap, readouts) = await snapshots.SaveAsync(model, request.Protocol ?? new SnapshotProtocol(), request.Notes ?? "",
                    request.ParentId, expression, request.ExpressionName, cancel);
                var link = $"{PublicBase(options.Value, http.Request)}/m/{snap.Id}";
                return TypedResults.Created($"/api/models/{snap.Id}",
                    new SavedModelResponse(snap.Id, link, snap.CatalogVersions, readouts.Rows, ResearchCaution.Text));
            })
            .WithName("SaveModel")
            .WithSummary("Stores an immutable snapshot (pinned model, protocol, read-outs, notes, optional expression table); returns its id and link.")
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429)
            .WithBodyLimit(BodyLimit.Snapshot)
            .AddEndpointFilter<RequestFieldLimits>()
            .RequireRateLimiting(RateLimits.ExpensivePolicy);

        api.MapGet("/{id}", Results<Ok<SnapshotResponse>, ProblemHttpResult> (string id, SnapshotService snapshots) =>
            {
                var snap = snapshots.Store.Find(id);
                if (snap is null)
                    return TypedResults.Problem($"There is no shared model '{id}'.", statusCode: StatusCodes.Status404NotFound, title: "Unknown shared model");
                var protocol = JsonSerializer.Deserialize<SnapshotProtocol>(snap.ProtocolJson, SnapshotService.Json) ?? new SnapshotProtocol();
                var readouts = JsonSerializer.Deserialize<List<ReadoutRow>>(snap.ReadoutsJson, SnapshotService.Json) ?? [];
                using var doc = JsonDocument.Parse(snap.ModelJson);
                return TypedResults.Ok(new SnapshotResponse(snap.Id, snap.ParentId, snap.CreatedUtc, doc.RootElement.Clone(), snap.CatalogVersions,
                    protocol, readouts, snap.Notes, snap.Expression is not null, ResearchCaution.Text));
            })
            .WithName("GetModel")
            .WithSummary("A stored snapshot: the pinned model file, its protocol and the read-outs saved with it.");
        return app;
    }

    /// <summary>
    /// Where share links start: the configured <see cref="WebOptions.PublicBaseUrl"/> (without a trailing slash), else the
    /// request's own scheme and Host header (right when clients reach the server directly).
    /// </summary>
    public static string PublicBase(WebOptions options, HttpRequest request) =>
        options.PublicBaseUrl is { Length: > 0 } configured ? configured.TrimEnd('/') : $"{request.Scheme}://{request.Host}{request.PathBase}";
}
