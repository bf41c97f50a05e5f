using System.Net;
using System.Net.Http.Json;
using System.Text.Json;

namespace ExprModel.Web.Tests.Hosting;

public sealed class RateLimitsTests
{
    [Fact]
    public async Task A_client_past_its_burst_gets_429_with_retry_after_while_cheap_routes_stay_open()
    {
        using var factory = new ConfiguredAppFactory(new Dictionary<string, string> { ["RateLimitPerMinute"] = "1", ["RateLimitBurst"] = "2" });
        var client = factory.CreateClient();
        // Bodies without a model: refused with 400, but each takes a token first (the limiter runs before the endpoint).
        for (int i = 0; i < 2; i++)
            Assert.Equal(HttpStatusCode.BadRequest, (await client.PostAsJsonAsync("/api/simulate", new { })).StatusCode);
        using var refused = await client.PostAsJsonAsync("/api/readouts", new { });
        Assert.Equal(HttpStatusCode.TooManyRequests, refused.StatusCode);
        var retryAfter = refused.Headers.RetryAfter?.Delta;
        Assert.NotNull(retryAfter);
        Assert.InRange(retryAfter.Value.TotalSeconds, 1, 60); // one token a minute
        Assert.Equal("application/problem+json", refused.Content.Headers.ContentType?.MediaType);
        var detail = JsonDocument.Parse(await refused.Content.ReadAsStringAsync()).RootElement.GetProperty("detail").GetString();
        Assert.Contains("RateLimitPerMinute", detail);
        Assert.Equal(HttpStatusCode.TooManyRequests, (await client.PostAsJsonAsync("/api/build", new { })).StatusCode);
        // The catalog is cheap and stays open.
        Assert.Equal(HttpStatusCode.OK, (await client.GetAsync("/api/catalog/presets")).StatusCode);
    }
}
