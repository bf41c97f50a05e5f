using System.Text.Json;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;
using Microsoft.AspNetCore.Diagnostics;
using Microsoft.AspNetCore.Mvc;

namespace ExprModel.Web.Hosting;

/// <summary>Turns the errors a user can act on into ProblemDetails responses saying what and where.</summary>
public sealed class ProblemMapping(IProblemDetailsService problems) : IExceptionHandler
{
    public async ValueTask<bool> TryHandleAsync(HttpContext http, Exception exception, CancellationToken cancel)
    {
        var (status, title, detail) = exception switch
        {
            UserInputException e => (400, "The request cannot be used", e.Message),
            UploadTooLargeException e => (413, "Upload too large", e.Message),
            SimulationTimeoutException e => (503, "Simulation time limit reached", e.Message),
            BadHttpRequestException { InnerException: JsonException j } => (400, "The request body is not valid JSON for this endpoint",
                JsonErrorMessage.For(j)),
            BadHttpRequestException e => (e.StatusCode, "Bad request", e.Message),
            OperationCanceledException when http.RequestAborted.IsCancellationRequested => (499, "Request cancelled", "The client closed the request."),
            _ => (0, "", ""),
        };
        if (status == 0) return false;
        http.Response.StatusCode = status;
        return await problems.TryWriteAsync(new ProblemDetailsContext
        {
            HttpContext = http,
            Exception = exception,
            ProblemDetails = new ProblemDetails { Status = status, Title = title, Detail = detail, Instance = http.Request.Path },
        });
    }
}

/// <summary>An upload larger than <see cref="WebOptions.MaxUploadMegabytes"/>.</summary>
public sealed class UploadTooLargeException(string message) : Exception(message);

/// <summary>Reads an upload into memory, stopping with a clear message as soon as it passes the configured limit.</summary>
public static class BoundedUpload
{
    public static string LimitMessage(long limitBytes, string what) =>
        $"{what} is larger than this server's upload limit of {limitBytes / (1024.0 * 1024.0):0.##} MB. Split the table, keep only the needed genes, or raise ExprModel:MaxUploadMegabytes.";

    public static async Task<byte[]> ReadAsync(Stream body, long? declaredLength, long limitBytes, string what, CancellationToken cancel)
    {
        if (declaredLength > limitBytes) throw new UploadTooLargeException(LimitMessage(limitBytes, what));
        using var buffer = new MemoryStream();
        var chunk = new byte[81920];
        int n;
        while ((n = await body.ReadAsync(chunk, cancel)) > 0)
        {
            if (buffer.Length + n > limitBytes) throw new UploadTooLargeException(LimitMessage(limitBytes, what));
            buffer.Write(chunk, 0, n);
        }
        return buffer.ToArray();
    }
}
