using System.Text;
using System.Text.Json;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Data.Catalog;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Apis;

/// <summary>A build request: the table (and optional metadata) as text, the target, the read choices, overrides and rule.</summary>
public sealed record BuildRequest
{
    /// <summary>The expression table as CSV or TSV text (genes x cells or cells x genes).</summary>
    public string? Expression { get; init; }
    public string ExpressionName { get; init; } = "expression.csv";
    public string? Metadata { get; init; }
    public string MetadataName { get; init; } = "metadata.csv";
    public string? GroupBy { get; init; }
    public string? Group { get; init; }
    public string? Cell { get; init; }
    /// <summary>genes-as-rows or cells-as-rows; absent = detect.</summary>
    public string? Orientation { get; init; }
    /// <summary>counts, cpm, tpm, fpkm or log-transformed; absent = detect.</summary>
    public string? Unit { get; init; }
    public IReadOnlyList<GeneOverride>? Overrides { get; init; }
    public string? ReferenceGroup { get; init; }
    public double Exponent { get; init; } = 1;
    public bool Clamp { get; init; } = true;
    public double CapacitancePf { get; init; } = 50;
    public double TemperatureC { get; init; } = 34;
}

public sealed record BuildResponse(JsonElement Model, IReadOnlyList<DensityDerivation> Densities, IReadOnlyList<string> Warnings,
    IReadOnlyList<UnmappedChannelGene> Unmapped, IReadOnlyList<string> Problems, string Caution);

/// <summary>Expression table to model: the library's readers, mapping and density rule, as the command line's build command uses them.</summary>
public static class BuildApi
{
    public static IEndpointRouteBuilder MapBuildApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api").WithTags("Build");

        api.MapPost("/build", async Task<Ok<BuildResponse>> (HttpRequest request, IOptions<WebOptions> options, ChannelCatalog catalog, CancellationToken cancel) =>
            {
                // Read the body ourselves, so an oversized upload stops at the limit with a clear message.
                var bytes = await BoundedUpload.ReadAsync(request.Body, request.ContentLength, options.Value.MaxUploadBytes, "The request (expression table)", cancel);
                BuildRequest? body;
                try { body = JsonSerializer.Deserialize<BuildRequest>(bytes, SnapshotService.Json); }
                catch (JsonException e)
                {
                    throw new UserInputException($"request body: line {(e.LineNumber ?? 0) + 1}, position {(e.BytePositionInLine ?? 0) + 1}: not valid JSON for a build request.");
                }
                if (body?.Expression is not { Length: > 0 } table) throw new UserInputException("expression: required (the table as CSV or TSV text).");
                if ((body.Group is null) == (body.Cell is null)) throw new UserInputException("give exactly one of group (with metadata and groupBy) or cell.");
                if (body.Group is not null && (body.Metadata is null || body.GroupBy is null)) throw new UserInputException("group: needs metadata (text) and groupBy (its column).");
                var session = await Task.Run(() => ExpressionSession.Read(catalog, Encoding.UTF8.GetBytes(table), body.ExpressionName,
                    body.Metadata is null ? null : Encoding.UTF8.GetBytes(body.Metadata), body.MetadataName,
                    new ReadChoices(body.Orientation, body.Unit, body.GroupBy)), cancel);
                var report = session.Map(body.Overrides ?? []);
                var rule = new DensityRule
                {
                    Reference = body.ReferenceGroup is null ? DensityReference.DatasetMedian : DensityReference.ReferenceGroup,
                    ReferenceGroup = body.ReferenceGroup,
                    Exponent = body.Exponent,
                    ClampToPlausibleRange = body.Clamp,
                    CapacitancePf = body.CapacitancePf,
                    TemperatureC = body.TemperatureC,
                };
                var built = session.Build(report, rule, body.Group is not null ? ModelTarget.ForGroup(body.Group) : ModelTarget.ForCell(body.Cell!));
                var doc = built.Document with { Caution = ResearchCaution.Text };
                return TypedResults.Ok(new BuildResponse(ModelRequest.ToElement(doc), built.Densities, built.Warnings, report.Unmapped, report.Problems, ResearchCaution.Text));
            })
            .WithName("BuildModel")
            .WithSummary("Builds a model from an expression table (JSON body: expression text, optional metadata and groupBy, group or cell, overrides, density rule).")
            .Accepts<BuildRequest>("application/json")
            .ProducesProblem(400).ProducesProblem(413)
            .DisableAntiforgery();
        return app;
    }
}
