using ExprModel.Web.Simulation;
using Microsoft.AspNetCore.WebUtilities;
using Microsoft.Net.Http.Headers;

namespace ExprModel.Web.Hosting;

/// <summary>
/// A multipart/form-data body read part by part with one byte budget for all parts together, so the upload limit means
/// the same for a form as for a JSON body (<see cref="BoundedUpload"/>). The framework's form binding is not used: it
/// buffers by its own limits and its errors would not say which limit or part was at fault.
/// </summary>
public sealed class MultipartForm
{
    private readonly Dictionary<string, List<FormPart>> _parts;

    private MultipartForm(Dictionary<string, List<FormPart>> parts) => _parts = parts;

    public IReadOnlyCollection<string> Names => _parts.Keys;

    /// <summary>The part of that name (the first, for a field that may repeat).</summary>
    public FormPart? Part(string name) => _parts.GetValueOrDefault(name)?[0];

    /// <summary>Every part of that name, in the order sent (several only for a field the reader allowed to repeat).</summary>
    public IReadOnlyList<FormPart> Parts(string name) => _parts.GetValueOrDefault(name) ?? [];

    public static bool IsMultipart(HttpRequest request) =>
        MediaTypeHeaderValue.TryParse(request.ContentType, out var type) && type.MediaType.Equals("multipart/form-data", StringComparison.OrdinalIgnoreCase);

    /// <param name="what">How the limit message names the upload.</param>
    /// <exception cref="UploadTooLargeException">The parts together pass <paramref name="limitBytes"/>.</exception>
    /// <param name="repeatable">Fields that may be sent several times (file inputs with several files); any other name twice is refused.</param>
    /// <exception cref="UserInputException">The body is not well-formed multipart data, or a part is named twice.</exception>
    public static async Task<MultipartForm> ReadAsync(HttpRequest request, long limitBytes, string what, CancellationToken cancel,
        params string[] repeatable)
    {
        if (request.ContentLength > limitBytes) throw new UploadTooLargeException(BoundedUpload.LimitMessage(limitBytes, what));
        var type = MediaTypeHeaderValue.Parse(request.ContentType);
        var boundary = HeaderUtilities.RemoveQuotes(type.Boundary).Value;
        if (string.IsNullOrEmpty(boundary)) throw new UserInputException("Content-Type: multipart/form-data needs a boundary parameter.");
        // The reader's own per-part cap (128 MB by default) is lifted: the budget below is the one limit, with its message.
        var reader = new MultipartReader(boundary, request.Body) { BodyLengthLimit = null };
        var parts = new Dictionary<string, List<FormPart>>(StringComparer.OrdinalIgnoreCase);
        int count = 0;
        long remaining = limitBytes;
        try
        {
            while (await reader.ReadNextSectionAsync(cancel) is { } section)
            {
                if (!ContentDispositionHeaderValue.TryParse(section.ContentDisposition, out var disposition)
                    || !disposition.DispositionType.Equals("form-data", StringComparison.OrdinalIgnoreCase))
                    throw new UserInputException($"multipart body: part {count + 1} has no 'Content-Disposition: form-data; name=...' header.");
                var name = HeaderUtilities.RemoveQuotes(disposition.Name).Value ?? "";
                if (name.Length == 0) throw new UserInputException($"multipart body: part {count + 1} has an empty name.");
                var bytes = await BoundedUpload.ReadAsync(section.Body, null, remaining, what, cancel);
                remaining -= bytes.Length;
                var fileName = disposition.IsFileDisposition()
                    ? HeaderUtilities.RemoveQuotes(disposition.FileNameStar.HasValue ? disposition.FileNameStar : disposition.FileName).Value : null;
                count++;
                if (!parts.TryGetValue(name, out var same)) parts.Add(name, [new FormPart(name, fileName, bytes)]);
                else if (repeatable.Contains(name, StringComparer.OrdinalIgnoreCase)) same.Add(new FormPart(name, fileName, bytes));
                else throw new UserInputException($"{name}: given twice; send each form field once.");
            }
        }
        catch (Exception e) when (e is InvalidDataException or IOException && !cancel.IsCancellationRequested)
        {
            // Malformed framing (a missing closing boundary, an over-long header) is the client's to fix.
            throw new UserInputException($"multipart body: {e.Message}");
        }
        return new MultipartForm(parts);
    }
}
