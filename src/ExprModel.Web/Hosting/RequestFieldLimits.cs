using System.Collections;
using System.Reflection;
using System.Text.Json;
using ExprModel.Web.Apis;
using ExprModel.Web.Simulation;
using Microsoft.Extensions.Options;

namespace ExprModel.Web.Hosting;

/// <summary>
/// An endpoint filter that refuses any text field of the bound request longer than <see cref="WebOptions.MaxTextFieldChars"/>
/// (400 naming the field by its JSON path, e.g. model.description), inside the model file as in the request's own fields.
/// Fields marked <see cref="BulkTextAttribute"/> carry whole tables and are bounded by the route's body limit instead.
/// </summary>
public sealed class RequestFieldLimits(IOptions<WebOptions> options) : IEndpointFilter
{
    /// <summary>Nesting followed into request objects (request, list, item, item's field); the model file is walked whole.</summary>
    private const int MaxDepth = 4;

    public ValueTask<object?> InvokeAsync(EndpointFilterInvocationContext context, EndpointFilterDelegate next)
    {
        int max = options.Value.MaxTextFieldChars;
        foreach (var argument in context.Arguments)
            if (argument is ModelRequest request) CheckRequest(request, max);
        return next(context);
    }

    /// <summary>Checks every text field of a request read by hand (the build and compare routes).</summary>
    public static void CheckRequest(object request, int max) => CheckObject(request, "", max, 0);

    /// <summary>Checks every text of a JSON value, naming it by its path below <paramref name="path"/>.</summary>
    public static void CheckJson(JsonElement element, string path, int max)
    {
        switch (element.ValueKind)
        {
            case JsonValueKind.String:
                Check(element.GetString()!, path, max);
                break;
            case JsonValueKind.Object:
                foreach (var p in element.EnumerateObject())
                {
                    Check(p.Name, $"{path} (a field name)", max);
                    CheckJson(p.Value, Join(path, p.Name), max);
                }
                break;
            case JsonValueKind.Array:
                int i = 0;
                foreach (var item in element.EnumerateArray()) CheckJson(item, $"{path}[{i++}]", max);
                break;
        }
    }

    private static void CheckObject(object value, string path, int max, int depth)
    {
        if (depth > MaxDepth) return;
        foreach (var property in value.GetType().GetProperties(BindingFlags.Public | BindingFlags.Instance))
        {
            if (property.GetIndexParameters().Length > 0 || property.IsDefined(typeof(BulkTextAttribute))) continue;
            string name = Join(path, JsonNamingPolicy.CamelCase.ConvertName(property.Name));
            switch (property.GetValue(value))
            {
                case string text: Check(text, name, max); break;
                case JsonElement json: CheckJson(json, name, max); break;
                case IEnumerable list:
                    int i = 0;
                    foreach (var item in list)
                    {
                        string at = $"{name}[{i++}]";
                        if (item is string s) Check(s, at, max);
                        else if (item is not null && IsRequestType(item.GetType())) CheckObject(item, at, max, depth + 1);
                    }
                    break;
                case { } nested when IsRequestType(nested.GetType()): CheckObject(nested, name, max, depth + 1); break;
            }
        }
    }

    /// <summary>The app's own request records (protocols, targets, overrides...), not framework or primitive types.</summary>
    private static bool IsRequestType(Type type) =>
        type.IsClass && type.Namespace?.StartsWith("ExprModel.", StringComparison.Ordinal) == true;

    private static void Check(string text, string path, int max)
    {
        if (text.Length > max)
            throw new UserInputException($"{path}: {text.Length:N0} characters, more than the {max:N0} a text field may hold on this server "
                + $"({WebOptions.Section}:MaxTextFieldChars).");
    }

    private static string Join(string path, string name) => path.Length == 0 ? name : $"{path}.{name}";
}
