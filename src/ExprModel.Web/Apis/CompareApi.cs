using System.Text;
using System.Text.Json;
using ExprModel.Core.Confrontation;
using ExprModel.Core.Export;
using ExprModel.Core.Expression;
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
/// Predicted against recorded read-outs (the library's <see cref="PredictedVersusRecorded"/>, as <c>exprmodel compare</c>
/// uses it): a JSON body with the tables as text, or a multipart form with the tables as file parts, like the build API.
/// </summary>
public static class CompareApi
{
    private static readonly string[] FormFields = [.. ExpressionRequest.CommonFormFields, "recorded", "recordedCellColumn", "map", "per", "shrink"];

    private sealed record CompareUpload(CompareRequest Options, IReadOnlyList<UploadedFile> Expression, string ExpressionName, byte[]? Metadata,
        string MetadataName,
        byte[]? Recorded, string RecordedName)
    {
        /// <summary>Recorded sweeps (multipart only): file name and bytes of each part named recording, recording2, ...</summary>
        public IReadOnlyList<(string FileName, byte[] Bytes)> Recordings { get; init; } = [];
    }

    /// <summary>Parts carrying recorded sweeps: "recording", "recording2", "recording3", ...</summary>
    private static bool IsRecordingPart(string name) =>
        name.StartsWith("recording", StringComparison.OrdinalIgnoreCase) && name[9..].All(char.IsAsciiDigit);

    public static IEndpointRouteBuilder MapCompareApi(this IEndpointRouteBuilder app)
    {
        var api = app.MapGroup("/api").WithTags("Compare");
        api.MapPost("/compare", async Task<Ok<CompareResponse>> (HttpRequest request, IOptions<WebOptions> options, ChannelCatalog catalog,
            SimulationGate gate, BuildQueue queue, CancellationToken cancel) =>
            {
                // As a build: a slot before the body is read.
                using var slot = await queue.EnterAsync(cancel);
                var o = options.Value;
                long limit = o.MaxUploadBytes;
                var upload = MultipartForm.IsMultipart(request)
                    ? FromForm(await MultipartForm.ReadAsync(request, limit, "The upload (expression, metadata and recorded files)", cancel, "expression"))
                    : FromJson(await BoundedUpload.ReadAsync(request.Body, request.ContentLength, limit, "The request (expression and recorded tables)",
                        cancel), o.MaxTextFieldChars);
                return TypedResults.Ok(await Compare(catalog, gate, upload, o.UploadLimits, cancel));
            })
            .WithName("CompareWithRecordings")
            .WithSummary("Builds a model per recorded cell (or per group), measures it and compares every read-out the recorded table has (columns matched by "
                + "header name and unit): per cell the difference and a z-score against the group's recorded SD, per group, and across cells Pearson and "
                + "Spearman r, mean absolute error and bias. JSON body (tables as text) or multipart form (expression, metadata, recorded as file parts; "
                + "recorded sweeps as file parts recording, recording2, ... (NWB or trace tables), measured per cell; where a table is also sent, "
                + "a cell's sweeps win).")
            .Accepts<CompareRequest>("application/json", "multipart/form-data")
            .ProducesProblem(400).ProducesProblem(413).ProducesProblem(429).ProducesProblem(503)
            .RequireRateLimiting(RateLimits.ExpensivePolicy)
            // As the build API: no cookies or sign-in, so a cross-site request gains nothing; the form is read by hand.
            .DisableAntiforgery();
        return app;
    }

    private static async Task<CompareResponse> Compare(ChannelCatalog catalog, SimulationGate gate, CompareUpload upload, UploadLimits limits,
        CancellationToken cancel)
    {
        var body = upload.Options;
        var per = body.Per switch
        {
            "cell" => ModelPer.Cell,
            "group" => ModelPer.Group,
            var p => throw new UserInputException($"per: '{p}' is not cell or group."),
        };
        var shrink = body.Shrink switch
        {
            "group" => ShrinkageMode.Group,
            "none" => ShrinkageMode.None,
            var s => throw new UserInputException($"shrink: '{s}' is not group or none."),
        };
        if (upload.Metadata is not null && body.GroupBy is null) throw new UserInputException("groupBy: needed with metadata (its group column).");
        if (per == ModelPer.Group && upload.Metadata is null) throw new UserInputException("per: group needs metadata and groupBy.");
        bool sweeps = upload.Recordings.Count > 0;
        // With recorded sweeps the table is used only when sent as 'recorded' (the metadata's recorded columns are not joined by default).
        var (tableBytes, tableName) = upload.Recorded is not null ? (upload.Recorded, upload.RecordedName)
            : upload.Metadata is not null && !sweeps ? (upload.Metadata, upload.MetadataName)
            : (null, "");
        if (tableBytes is null && !sweeps)
            throw new UserInputException("recorded: required (per-cell recorded values with units in the headers), unless the metadata holds them or "
                + "recordings are sent.");

        var session = ExpressionSession.Read(catalog, upload.Expression, upload.Metadata, upload.MetadataName,
            body.ReadChoices(), limits, cancel);
        var report = session.Map(body.Overrides ?? []);
        var rule = body.DensityRule();
        var cells = session.Dataset.Table.CellIds.ToHashSet(StringComparer.Ordinal);
        var table = tableBytes is null ? null : RecordedUploads.Table(tableBytes, tableName, body.RecordedCellColumn, body.Map, cells.Contains);
        RecordedFeatures? fromSweeps = null;
        if (sweeps)
        {
            var measured = await gate.RunAsync(_ => RecordedUploads.Measure(upload.Recordings), cancel);
            string sources = string.Join(", ", upload.Recordings.Select(r => Path.GetFileName(r.FileName)));
            try { fromSweeps = RecordedSweepFeatures.From(measured, sources, cells.Contains); }
            catch (Core.Recordings.RecordingFormatException e) { throw new UserInputException(e.Message); }
        }
        var features = fromSweeps is null ? table! : table is null ? fromSweeps : RecordedSweepFeatures.Join(fromSweeps, table);
        var result = await gate.RunAsync(c =>
        {
            try { return PredictedVersusRecorded.Run(session.Dataset, report, rule, features, per, shrink, null, c); }
            catch (ArgumentException e) { throw new UserInputException(e.Message); }
        }, cancel);
        var csv = ConfrontationTable.Create(result, ConfrontationTable.Comments(result, ResearchCaution.Text, upload.ExpressionName)).ToString();
        return new CompareResponse(features.Matches, body.Per, result.ExpressionNote, result.Agreement, result.Groups, result.Cells,
            [.. session.Dataset.Notes, .. features.Notes], csv, ResearchCaution.Text);
    }

    private static CompareUpload FromJson(byte[] bytes, int maxTextFieldChars)
    {
        CompareRequest? body;
        try { body = JsonSerializer.Deserialize<CompareRequest>(bytes, SnapshotService.StrictJson); }
        catch (JsonException e)
        {
            throw new UserInputException(JsonErrorMessage.For(e, "request body"));
        }
        if (body is null) throw new UserInputException("request body: a JSON object with the fields expression and recorded is required.");
        RequestFieldLimits.CheckRequest(body, maxTextFieldChars);
        if (body.Expression is not { } table) throw new UserInputException("expression: required (the table as CSV or TSV text).");
        static byte[]? Bytes(string? text) => text is null ? null : Encoding.UTF8.GetBytes(text);
        return new CompareUpload(body, [new UploadedFile(body.ExpressionName, Encoding.UTF8.GetBytes(table))], body.ExpressionName, Bytes(body.Metadata),
            body.MetadataName, Bytes(body.Recorded),
            body.RecordedName);
    }

    private static CompareUpload FromForm(MultipartForm form)
    {
        foreach (var name in form.Names)
            if (!FormFields.Contains(name, StringComparer.OrdinalIgnoreCase) && !IsRecordingPart(name))
                throw new UserInputException($"{name}: not a field of this endpoint (fields: {string.Join(", ", FormFields)}, and recording, recording2, "
                    + "... for recorded sweeps).");
        var expression = BuildApi.ExpressionFiles(form, new CompareRequest().ExpressionName);
        var (metadata, recorded) = (form.Part("metadata"), form.Part("recorded"));
        var d = new CompareRequest();
        var options = ExpressionRequest.WithCommonFields(d with
        {
            RecordedCellColumn = BuildApi.Text(form, "recordedCellColumn"),
            Map = Map(form),
            Per = BuildApi.Text(form, "per") ?? d.Per,
            Shrink = BuildApi.Text(form, "shrink") ?? d.Shrink,
        }, form);
        var recordings = form.Names.Where(IsRecordingPart).Order(StringComparer.OrdinalIgnoreCase).Select(n => form.Part(n)!)
            .Select(p => (p.FileName
                ?? throw new UserInputException($"{p.Name}: send recorded sweeps as a file part with its file name (.nwb, .csv, .tsv or .txt)."),
                p.Bytes)).ToArray();
        return new CompareUpload(options, expression, string.Join(", ", expression.Select(e => e.Name)), metadata?.Bytes, metadata?.FileName ?? d.MetadataName,
            recorded?.Bytes, recorded?.FileName ?? d.RecordedName)
        { Recordings = recordings };
    }

    private static Dictionary<string, string>? Map(MultipartForm form)
    {
        if (BuildApi.Text(form, "map") is not { } json) return null;
        try { return JsonSerializer.Deserialize<Dictionary<string, string>>(json, SnapshotService.StrictJson); }
        catch (JsonException e)
        {
            throw new UserInputException($"map: line {(e.LineNumber ?? 0) + 1}, position {(e.BytePositionInLine ?? 0) + 1}: not a JSON object of column: "
                + "read-out pairs, "
                + "e.g. {\"Vrest (mV)\": \"resting_potential\"}.");
        }
    }
}
