using Microsoft.Extensions.Options;

namespace ExprModel.Web.Hosting;

/// <summary>
/// Applies each route's <see cref="BodyLimit"/> before anything reads the body: a declared Content-Length over the limit is
/// refused at once (413, nothing read), and any other body (chunked) is counted as it streams and refused at the first byte
/// past the limit, so no route buffers more than its limit however large the request.
/// </summary>
public static class RequestBodyLimits
{
    public static TBuilder WithBodyLimit<TBuilder>(this TBuilder builder, BodyLimit limit) where TBuilder : IEndpointConventionBuilder =>
        builder.WithMetadata(limit);

    /// <summary>Place after routing (the endpoint is known) and before the endpoints run.</summary>
    public static IApplicationBuilder UseRequestBodyLimits(this IApplicationBuilder app) => app.Use(async (context, next) =>
    {
        if (context.GetEndpoint()?.Metadata.GetMetadata<BodyLimit>() is { } limit)
        {
            long bytes = limit.Bytes(context.RequestServices.GetRequiredService<IOptions<WebOptions>>().Value);
            if (context.Request.ContentLength > bytes) throw new UploadTooLargeException(limit.Message(bytes));
            context.Request.Body = new LimitedRequestBody(context.Request.Body, bytes, limit.Message(bytes));
        }
        await next(context);
    });
}
