using System.Net.Http.Json;
using System.Text.Json;
using System.Text.Json.Nodes;
using Microsoft.AspNetCore.Mvc.Testing;

namespace ExprModel.Web.Tests.Apis;

public abstract class ApiTestBase(WebApplicationFactory<Program> factory) : IClassFixture<AppFactory>
{
    protected HttpClient Client { get; } = factory.CreateClient();

    protected static JsonNode Preset(string id)
    {
        for (var d = new DirectoryInfo(AppContext.BaseDirectory); d is not null; d = d.Parent)
        {
            var f = Path.Combine(d.FullName, "catalog", "models", id + ".json");
            if (File.Exists(f)) return JsonNode.Parse(File.ReadAllText(f))!;
        }
        throw new FileNotFoundException(id);
    }

    protected static async Task<JsonElement> Json(HttpResponseMessage r) => (await r.Content.ReadFromJsonAsync<JsonElement>());

    /// <summary>Asserts a ProblemDetails body with the status and a detail containing every fragment.</summary>
    protected static async Task AssertProblem(HttpResponseMessage r, int status, params string[] fragments)
    {
        Assert.Equal(status, (int)r.StatusCode);
        Assert.Equal("application/problem+json", r.Content.Headers.ContentType?.MediaType);
        var body = await Json(r);
        Assert.Equal(status, body.GetProperty("status").GetInt32());
        var detail = body.GetProperty("detail").GetString() ?? "";
        foreach (var f in fragments) Assert.Contains(f, detail);
    }
}
