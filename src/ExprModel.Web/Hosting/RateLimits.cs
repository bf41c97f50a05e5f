using System.Globalization;
using System.Threading.RateLimiting;
using Microsoft.AspNetCore.Mvc;
using Microsoft.AspNetCore.RateLimiting;

namespace ExprModel.Web.Hosting;

/// <summary>
/// Per-client rate limiting of the expensive API routes (builds, simulations, read-outs, what-if, shares) with ASP.NET Core's
/// rate limiter: a token bucket per remote address holding <see cref="WebOptions.RateLimitBurst"/> requests and refilled at
/// <see cref="WebOptions.RateLimitPerMinute"/>. A refused request gets 429 with Retry-After (seconds until the next token)
/// and a problem body naming the settings. Behind a reverse proxy every client shares the proxy's address unless forwarded
/// headers are configured.
/// </summary>
public static class RateLimits
{
    public const string ExpensivePolicy = "expensive";

    public static IServiceCollection AddExprModelRateLimits(this IServiceCollection services, WebOptions options) =>
        services.AddRateLimiter(limiter =>
        {
            limiter.RejectionStatusCode = StatusCodes.Status429TooManyRequests;
            limiter.AddPolicy(ExpensivePolicy, http =>
            {
                string client = http.Connection.RemoteIpAddress?.ToString() ?? "unknown";
                if (options.RateLimitPerMinute <= 0) return RateLimitPartition.GetNoLimiter(client);
                return RateLimitPartition.GetTokenBucketLimiter(client, _ => new TokenBucketRateLimiterOptions
                {
                    TokenLimit = options.RateLimitBurst,
                    TokensPerPeriod = 1,
                    ReplenishmentPeriod = TimeSpan.FromMinutes(1) / options.RateLimitPerMinute,
                    QueueLimit = 0,
                    AutoReplenishment = true,
                });
            });
            limiter.OnRejected = async (context, cancel) =>
            {
                int seconds = context.Lease.TryGetMetadata(MetadataName.RetryAfter, out var after) ? Math.Max(1, (int)Math.Ceiling(after.TotalSeconds)) : 1;
                var http = context.HttpContext;
                http.Response.Headers.RetryAfter = seconds.ToString(CultureInfo.InvariantCulture);
                var problems = http.RequestServices.GetRequiredService<IProblemDetailsService>();
                await problems.WriteAsync(new ProblemDetailsContext
                {
                    HttpContext = http,
                    ProblemDetails = new ProblemDetails
                    {
                        Status = StatusCodes.Status429TooManyRequests,
                        Title = "Too many requests",
                        Detail = $"This client has used its {options.RateLimitBurst} requests in a burst to the simulation, build and share routes "
                            + $"(refilled at {options.RateLimitPerMinute} per minute: {WebOptions.Section}:RateLimitBurst, RateLimitPerMinute). "
                            + $"Try again in {seconds} s.",
                        Instance = http.Request.Path,
                    },
                });
            };
        });
}
