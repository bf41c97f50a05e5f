using ExprModel.Core.Kinetics;
using ExprModel.Data.Catalog;
using ExprModel.Web.Workspace;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.AspNetCore.Mvc;

namespace ExprModel.Web.Apis;

/// <summary>Read-only access to the channel-kinetics catalog.</summary>
public static class CatalogApi
{
    public static IEndpointRouteBuilder MapCatalogApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api/catalog").WithTags("Catalog");

        api.MapGet("/", (ChannelCatalog catalog, string? q, string? family, string? ion) =>
                TypedResults.Ok(catalog.Latest.Where(e => CatalogViews.Matches(catalog, e, q, family, ion)).Select(e => CatalogViews.Summary(catalog, e))
                    .ToArray()))
            .WithName("ListCatalogEntries")
            .WithSummary("Latest version of every catalog entry, optionally filtered by gene/name text (q), family or ion.");

        api.MapGet("/{id}", Results<Ok<CatalogEntryDetail>, ProblemHttpResult> (ChannelCatalog catalog, string id, int? version, double? temperatureC) =>
            {
                if (!catalog.Contains(id)) return TypedResults.Problem($"There is no catalog entry '{id}'.", statusCode: StatusCodes.Status404NotFound,
                    title: "Unknown catalog entry");
                if (temperatureC is { } t && (t < -5 || t > 50))
                    return TypedResults.Problem($"temperatureC must lie between -5 and 50 (got {t}).", statusCode: 400, title: "Bad temperature");
                try
                {
                    var e = catalog.Resolve(id, version);
                    double at = temperatureC ?? e.ReferenceTemperatureC;
                    var versions = catalog.AllVersions.Where(x => x.Id == id).Select(x => x.Version).Order().ToArray();
                    return TypedResults.Ok(new CatalogEntryDetail(CatalogViews.Summary(catalog, e), versions, e.Preparation, e.CuratorNote,
                        CatalogViews.Word(e.Reversal), e.ReversalMv, e.MinDensityMsPerCm2, e.MaxDensityMsPerCm2, e.Source.Location, at,
                            CatalogViews.Curves(e, at), CatalogViews.Forms(e, at), GateForms.ParameterCount(e)));
                }
                catch (CatalogException ex)
                {
                    return TypedResults.Problem(ex.Message, statusCode: StatusCodes.Status404NotFound, title: "Unknown catalog version");
                }
            })
            .WithName("GetCatalogEntry")
            .WithSummary("One entry (latest or ?version=N) with citation, genes and its gates' steady-state and time-constant curves at ?temperatureC, " +
                "each gate in both forms (rates and steady state with time constant, one converted) and the parameter counts.");

        api.MapGet("/presets", (ChannelCatalog catalog) =>
                TypedResults.Ok(catalog.Presets.OrderBy(p => p.Key, StringComparer.Ordinal)
                    .Select(p => new { id = p.Key, name = p.Value.Name, citation = p.Value.Citation }).ToArray()))
            .WithName("ListPresets")
            .WithSummary("The complete published models shipped with the catalog.");
        return app;
    }
}
