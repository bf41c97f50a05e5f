using System.Globalization;
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

/// <summary>
/// Expression table to model: the library's readers, mapping and density rule (through <see cref="ExpressionSession"/>),
/// as the command line's build command uses them. The table comes as text in a JSON body or as a file part of a
/// multipart form (any format the library reads: CSV or TSV, gzip or not, or AnnData .h5ad; a Matrix Market matrix with its sidecars
/// as several expression parts or in one .zip or .tar.gz archive).
/// </summary>
public static class BuildApi
{
    /// <summary>The form fields of a multipart build request besides the file parts; the same options as the JSON body.</summary>
    private static readonly string[] FormFields = [.. ExpressionRequest.CommonFormFields, "group", "cell"];

    /// <summary>What a build needs, however it arrived: the options, the table's bytes and name, the metadata's.</summary>
    private sealed record BuildUpload(BuildRequest Options, IReadOnlyList<UploadedFile> Expression, byte[]? Metadata, string MetadataName);

    public static IEndpointRouteBuilder MapBuildApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api").WithTags("Build");

        api.MapPost("/build",
            async Task<Ok<BuildResponse>> (HttpRequest request, IOptions<WebOptions> options, ChannelCatalog catalog, BuildQueue queue,
                CancellationToken cancel) =>
            {
                // A slot first, then the body: the queue bounds the uploads held in memory as well as the builds running.
                using var slot = await queue.EnterAsync(cancel);
                // Read the body ourselves, so an oversized upload stops at the limit with a clear message (one limit for both forms).
                var o = options.Value;
                long limit = o.MaxUploadBytes;
                var upload = MultipartForm.IsMultipart(request)
                    ? FromForm(await MultipartForm.ReadAsync(request, limit, "The upload (expression and metadata files)", cancel, "expression"))
                    : FromJson(await BoundedUpload.ReadAsync(request.Body, request.ContentLength, limit, "The request (expression table)", cancel),
                        o.MaxTextFieldChars);
                return TypedResults.Ok(await Task.Run(() => Build(catalog, upload, o.UploadLimits, cancel), cancel));
            })
            .WithName("BuildModel")
            .WithSummary("Builds a model from an expression table: a JSON body (expression as text) or a multipart form "
                + "(expression and optional metadata as file parts; expression repeated for a Matrix Market matrix with its genes and barcodes "
                + "files, or one .zip or .tar.gz archive of them; groupBy, group or cell, orientation, unit, matrix (h5ad: X, layer:NAME or raw), "
                + "referenceGroup, exponent, clamp, capacitancePf, temperatureC and overrides (a JSON array) as fields). "
                + "At most ExprModel:MaxConcurrentBuilds run at once and MaxQueuedBuilds wait; past that the answer is 503 with Retry-After.")
            // One Accepts call with both types: routing and the OpenAPI generator read only the last Accepts metadata, so a
            // second call would turn JSON requests away (415). The form's own schema replaces the JSON one for multipart.
            .Accepts<BuildRequest>("application/json", "multipart/form-data")
            .AddOpenApiOperationTransformer(async (operation, context, cancel) =>
            {
                if (operation.RequestBody?.Content?.TryGetValue("multipart/form-data", out var form) == true)
                    form.Schema = await context.GetOrCreateSchemaAsync(typeof(BuildForm), null, cancel);
            })
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429).ProducesProblem(503)
            .RequireRateLimiting(RateLimits.ExpensivePolicy)
            // Scripts call this API with no cookie: the app has no sign-in and no cookie authentication, so a forged
            // cross-site request carries no credentials and gains nothing the caller could not do directly. The other
            // API routes take JSON and need no token either; the form here is read by hand, not by form binding.
            .DisableAntiforgery();
        return app;
    }

    private static BuildResponse Build(ChannelCatalog catalog, BuildUpload upload, UploadLimits limits, CancellationToken cancel)
    {
        var body = upload.Options;
        if ((body.Group is null) == (body.Cell is null)) throw new UserInputException("give exactly one of group (with metadata and groupBy) or cell.");
        if (body.Group is not null && (upload.Metadata is null || body.GroupBy is null))
            throw new UserInputException("group: needs metadata and groupBy (its column).");
        var session = ExpressionSession.Read(catalog, upload.Expression, upload.Metadata, upload.MetadataName,
            body.ReadChoices(), limits, cancel);
        var report = session.Map(body.Overrides ?? []);
        var built = session.Build(report, body.DensityRule(), body.Group is not null ? ModelTarget.ForGroup(body.Group) : ModelTarget.ForCell(body.Cell!));
        var doc = built.Document with { Caution = ResearchCaution.Text };
        return new BuildResponse(ModelRequest.ToElement(doc), built.Densities, built.Warnings, report.Unmapped, report.Problems, ResearchCaution.Text,
            report.Proxies);
    }

    private static BuildUpload FromJson(byte[] bytes, int maxTextFieldChars)
    {
        BuildRequest? body;
        try { body = JsonSerializer.Deserialize<BuildRequest>(bytes, SnapshotService.StrictJson); }
        catch (JsonException e)
        {
            throw new UserInputException(JsonErrorMessage.For(e, "request body"));
        }
        if (body is null) throw new UserInputException("request body: a JSON object with the field expression (the table as text) is required.");
        RequestFieldLimits.CheckRequest(body, maxTextFieldChars);
        if (body.Expression is not { } table) throw new UserInputException("expression: required (the table as CSV or TSV text).");
        return new BuildUpload(body, [new UploadedFile(body.ExpressionName, Encoding.UTF8.GetBytes(table))],
            body.Metadata is null ? null : Encoding.UTF8.GetBytes(body.Metadata),
            body.MetadataName);
    }

    /// <summary>Reads the form's fields into the same request as the JSON body; a bad field is a problem naming it.</summary>
    private static BuildUpload FromForm(MultipartForm form)
    {
        foreach (var name in form.Names)
            if (!FormFields.Contains(name, StringComparer.OrdinalIgnoreCase))
                throw new UserInputException($"{name}: not a field of this endpoint (fields: {string.Join(", ", FormFields)}).");
        var defaults = new BuildRequest();
        var expression = ExpressionFiles(form, defaults.ExpressionName);
        var metadata = form.Part("metadata");
        var options = ExpressionRequest.WithCommonFields(defaults with { Group = Text(form, "group"), Cell = Text(form, "cell") }, form);
        return new BuildUpload(options, expression, metadata?.Bytes,
            metadata?.FileName ?? defaults.MetadataName);
    }

    /// <summary>
    /// The expression file parts: one table, or a Matrix Market matrix with its genes and barcodes files as several parts
    /// named expression, or one .zip / .tar.gz archive holding them (sorted by content and name in <see cref="ExpressionParts"/>).
    /// </summary>
    internal static IReadOnlyList<UploadedFile> ExpressionFiles(MultipartForm form, string defaultName)
    {
        var parts = form.Parts("expression");
        if (parts.Count == 0)
            throw new UserInputException("expression: required, as a file part (CSV or TSV, optionally gzip, or AnnData .h5ad), or as several parts "
                + "(a Matrix Market matrix with its genes and barcodes files), or one .zip or .tar.gz archive of them.");
        return parts.Select((p, i) => new UploadedFile(p.FileName ?? (parts.Count == 1 ? defaultName : $"expression-part-{i + 1}"), p.Bytes)).ToList();
    }

    /// <summary>A text field; an empty field counts as absent, as a browser form sends it.</summary>
    internal static string? Text(MultipartForm form, string field) => form.Part(field)?.Text.Trim() is { Length: > 0 } t ? t : null;

    internal static double? Number(MultipartForm form, string field) => Text(form, field) is not { } t ? null
        : double.TryParse(t, NumberStyles.Float, CultureInfo.InvariantCulture, out var v) && double.IsFinite(v) ? v
        : throw new UserInputException($"{field}: '{t}' is not a number (use a decimal point, e.g. 1.5).");

    internal static bool? Flag(MultipartForm form, string field) => Text(form, field)?.ToLowerInvariant() switch
    {
        null => null,
        "true" or "on" or "1" => true,
        "false" or "off" or "0" => false,
        var t => throw new UserInputException($"{field}: '{t}' is not true or false."),
    };

    internal static List<GeneOverride>? Overrides(MultipartForm form)
    {
        if (Text(form, "overrides") is not { } json) return null;
        try { return JsonSerializer.Deserialize<List<GeneOverride>>(json, SnapshotService.StrictJson); }
        catch (JsonException e)
        {
            throw new UserInputException(JsonErrorMessage.For(e, "overrides",
                "not a JSON array of {\"gene\": ..., \"exclude\": true} / {\"gene\": ..., \"entryId\": ..., \"weight\": ...} objects."));
        }
    }
}
