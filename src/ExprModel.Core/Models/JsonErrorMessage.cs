using System.Text.Json;

namespace ExprModel.Core.Models;

/// <summary>
/// The one wording for JSON that cannot be read, wherever it comes from (a model file, a catalog entry, a request body,
/// a form field): "source: line L, position P, at $.path: reason", with line and position counted from 1 as editors do.
/// </summary>
public static class JsonErrorMessage
{
    /// <param name="source">The file or field the JSON came from; null leaves the prefix out.</param>
    /// <param name="reason">What was expected, in the caller's words; null uses the parser's own first sentence.</param>
    public static string For(JsonException e, string? source = null, string? reason = null) =>
        $"{(source is null ? "" : source + ": ")}{Location(e)}: {reason ?? Reason(e)}";

    /// <summary>"line L, position P, at $.path" (1-based; "$" when the parser gives no path).</summary>
    public static string Location(JsonException e) =>
        $"line {(e.LineNumber ?? 0) + 1}, position {(e.BytePositionInLine ?? 0) + 1}, at {(string.IsNullOrEmpty(e.Path) ? "$" : e.Path)}";

    /// <summary>The parser's message without the location it appends (" Path: ... | LineNumber: ..."), which <see cref="Location"/> gives.</summary>
    public static string Reason(JsonException e)
    {
        // The serializer's refusal of an unknown member names a .NET type; say it in the request's terms.
        const string Unmapped = "The JSON property '", UnmappedEnd = "' could not be mapped";
        if (e.Message.StartsWith(Unmapped, StringComparison.Ordinal) && e.Message.IndexOf(UnmappedEnd, StringComparison.Ordinal) is int end and > 0)
            return $"unknown field '{e.Message[Unmapped.Length..end]}': not a field here (check its spelling); unknown fields are refused";
        int cut = e.Message.IndexOf(" Path:", StringComparison.Ordinal);
        return cut > 0 ? e.Message[..cut] : e.Message;
    }
}
