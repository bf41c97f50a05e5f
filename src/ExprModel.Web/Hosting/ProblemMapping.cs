using System.Text.Json;
using ExprModel.Core.Models;
using ExprModel.Data.Store;
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
            UploadTooLargeException e => (413, "Request too large", e.Message),
            ServerBusyException e => (503, "Server busy", e.Message),
            SimulationTimeoutException e => (503, "Simulation time limit reached", e.Message),
            SnapshotStoreException e => (503, "The shared-model store is unavailable", e.Message),
            BadHttpRequestException { InnerException: JsonException j } => (400, "The request body is not valid JSON for this endpoint",
                JsonErrorMessage.For(j)),
            BadHttpRequestException e => (e.StatusCode, "Bad request", e.Message),
            OperationCanceledException when http.RequestAborted.IsCancellationRequested => (499, "Request cancelled", "The client closed the request."),
            _ => (0, "", ""),
        };
        if (status == 0) return false;
        http.Response.StatusCode = status;
        if (exception is ServerBusyException busy)
            http.Response.Headers.RetryAfter = busy.RetryAfterSeconds.ToString(System.Globalization.CultureInfo.InvariantCulture);
        return await problems.TryWriteAsync(new ProblemDetailsContext
        {
            HttpContext = http,
            Exception = exception,
            ProblemDetails = new ProblemDetails { Status = status, Title = title, Detail = detail, Instance = http.Request.Path },
        });
    }
}
