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
    private readonly Dictionary<string, FormPart> _parts;

    private MultipartForm(Dictionary<string, FormPart> parts) => _parts = parts;

    public IReadOnlyCollection<string> Names => _parts.Keys;

    public FormPart? Part(string name) => _parts.GetValueOrDefault(name);

    public static bool IsMultipart(HttpRequest request) =>
        MediaTypeHeaderValue.TryParse(request.ContentType, out var type) && type.MediaType.Equals("multipart/form-data", StringComparison.OrdinalIgnoreCase);

    /// <param name="what">How the limit message names the upload.</param>
    /// <exception cref="UploadTooLargeException">The parts together pass <paramref name="limitBytes"/>.</exception>
    /// <exception cref="UserInputException">The body is not well-formed multipart data, or a part is named twice.</exception>
    public static async Task<MultipartForm> ReadAsync(HttpRequest request, long limitBytes, string what, CancellationToken cancel)
    {
        if (request.ContentLength > limitBytes) throw new UploadTooLargeException(BoundedUpload.LimitMessage(limitBytes, what));
        var type = MediaTypeHeaderValue.Parse(request.ContentType);
        var boundary = HeaderUtilities.RemoveQuotes(type.Boundary).Value;
        if (string.IsNullOrEmpty(boundary)) throw new UserInputException("Content-Type: multipart/form-data needs a boundary parameter.");
        // The reader's own per-part cap (128 MB by default) is lifted: the budget below is the one limit, with its message.
        var reader = new MultipartReader(boundary, request.Body) { BodyLengthLimit = null };
        var parts = new Dictionary<string, FormPart>(StringComparer.OrdinalIgnoreCase);
        long remaining = limitBytes;
        try
        {
            while (await reader.ReadNextSectionAsync(cancel) is { } section)
            {
                if (!ContentDispositionHeaderValue.TryParse(section.ContentDisposition, out var disposition)
                    || !disposition.DispositionType.Equals("form-data", StringComparison.OrdinalIgnoreCase))
                    throw new UserInputException($"multipart body: part {parts.Count + 1} has no 'Content-Disposition: form-data; name=...' header.");
                var name = HeaderUtilities.RemoveQuotes(disposition.Name).Value ?? "";
                if (name.Length == 0) throw new UserInputException($"multipart body: part {parts.Count + 1} has an empty name.");
                var bytes = await BoundedUpload.ReadAsync(section.Body, null, remaining, what, cancel);
                remaining -= bytes.Length;
                var fileName = disposition.IsFileDisposition()
                    ? HeaderUtilities.RemoveQuotes(disposition.FileNameStar.HasValue ? disposition.FileNameStar : disposition.FileName).Value : null;
                if (!parts.TryAdd(name, new FormPart(name, fileName, bytes))) throw new UserInputException($"{name}: given twice; send each form field once.");
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
