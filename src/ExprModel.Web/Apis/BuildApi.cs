using ExprModel.Web.Hosting;
using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Apis;

/// <summary>Expression table to model: the same builder as the command line's build command.</summary>
public static class BuildApi
{
    public static IEndpointRouteBuilder MapBuildApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api").WithTags("Build");

        api.MapPost("/build", async Task<ProblemHttpResult> (HttpRequest request, IOptions<WebOptions> options, CancellationToken cancel) =>
            {
                var bytes = await BoundedUpload.ReadAsync(request.Body, request.ContentLength, options.Value.MaxUploadBytes, "The expression table", cancel);
                _ = bytes;
                return TypedResults.Problem("Building a model from expression is not available in this build yet (the mapping library has not landed).",
                    statusCode: StatusCodes.Status501NotImplemented, title: "Not available yet");
            })
            .WithName("BuildModel")
            .WithSummary("Builds a model from an expression table sent as the request body (CSV/TSV, optionally gzip), for ?group= or ?cell=.")
            .DisableAntiforgery();
        return app;
    }
}
