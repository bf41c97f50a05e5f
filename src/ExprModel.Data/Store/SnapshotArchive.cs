using System.Globalization;
using System.Text.Json;
using ExprModel.Core.Models;

namespace ExprModel.Data.Store;

/// <summary>
/// The export file of a snapshot store: one JSON document (<c>format</c> "exprmodel-snapshots", <c>formatVersion</c> 1,
/// the research-use caution, and every snapshot with its fields as stored and its <c>sha256</c>). Writing goes to a
/// temporary file moved into place, so an interrupted export never leaves a half-written file under the given name;
/// reading checks every checksum and refuses the file naming the first snapshot that does not match.
/// </summary>
public static class SnapshotArchive
{
    public const string Format = "exprmodel-snapshots";
    public const int FormatVersion = 1;

    public static void Write(string path, IReadOnlyList<Snapshot> snapshots)
    {
        var full = Path.GetFullPath(path);
        var partial = full + ".partial-" + Guid.NewGuid().ToString("N");
        try
        {
            using (var stream = File.Create(partial))
            using (var w = new Utf8JsonWriter(stream, new JsonWriterOptions { Indented = true }))
            {
                w.WriteStartObject();
                w.WriteString("format", Format);
                w.WriteNumber("formatVersion", FormatVersion);
                w.WriteString("caution", ResearchCaution.Text);
                w.WriteString("exportedUtc", DateTimeOffset.UtcNow.ToString("O", CultureInfo.InvariantCulture));
                w.WriteStartArray("snapshots");
                foreach (var s in snapshots)
                {
                    w.WriteStartObject();
                    w.WriteString("id", s.Id);
                    w.WriteString("parentId", s.ParentId);
                    w.WriteString("createdUtc", s.CreatedUtc.ToString("O", CultureInfo.InvariantCulture));
                    w.WriteString("model", s.ModelJson);
                    w.WriteStartArray("catalogVersions");
                    foreach (var v in s.CatalogVersions) w.WriteStringValue(v);
                    w.WriteEndArray();
                    w.WriteString("protocol", s.ProtocolJson);
                    w.WriteString("readouts", s.ReadoutsJson);
                    w.WriteString("notes", s.Notes);
                    if (s.Expression is null) w.WriteNull("expressionBase64");
                    else w.WriteString("expressionBase64", Convert.ToBase64String(s.Expression));
                    w.WriteString("expressionName", s.ExpressionName);
                    w.WriteString("recorded", s.RecordedJson);
                    w.WriteString("sha256", s.ContentSha256);
                    w.WriteEndObject();
                }
                w.WriteEndArray();
                w.WriteEndObject();
            }
            File.Move(partial, full, overwrite: true);
        }
        finally
        {
            if (File.Exists(partial)) File.Delete(partial);
        }
    }

    /// <summary>Reads an export file; every error names the file and, past the header, the snapshot (index and id).</summary>
    public static IReadOnlyList<Snapshot> Read(string path)
    {
        if (!File.Exists(path)) throw new SnapshotException($"{path}: no such file.");
        JsonDocument doc;
        try
        {
            doc = JsonDocument.Parse(File.ReadAllBytes(path));
        }
        catch (JsonException e)
        {
            throw new SnapshotException($"{path}: line {e.LineNumber + 1}, byte {e.BytePositionInLine + 1}: not valid JSON.");
        }
        using (doc)
        {
            var root = doc.RootElement;
            if (root.ValueKind != JsonValueKind.Object || !root.TryGetProperty("format", out var f) || f.ValueKind != JsonValueKind.String
                || f.GetString() != Format)
                throw new SnapshotException($"{path}: not a snapshot export (format must be \"{Format}\").");
            if (!root.TryGetProperty("formatVersion", out var v) || !v.TryGetInt32(out var version) || version != FormatVersion)
                throw new SnapshotException($"{path}: formatVersion must be {FormatVersion}.");
            if (!root.TryGetProperty("snapshots", out var list) || list.ValueKind != JsonValueKind.Array)
                throw new SnapshotException($"{path}: snapshots: expected an array.");
            var result = new List<Snapshot>();
            int index = 0;
            foreach (var e in list.EnumerateArray())
            {
                var where = $"{path}: snapshots[{index}]";
                if (e.ValueKind != JsonValueKind.Object) throw new SnapshotException($"{where}: expected an object.");
                var id = Text(e, "id", where)!;
                where += $" (id {id})";
                var snap = new Snapshot
                {
                    Id = id,
                    ParentId = Text(e, "parentId", where, optional: true),
                    CreatedUtc = Created(Text(e, "createdUtc", where)!, where),
                    ModelJson = Text(e, "model", where)!,
                    CatalogVersions = Versions(e, where),
                    ProtocolJson = Text(e, "protocol", where)!,
                    ReadoutsJson = Text(e, "readouts", where)!,
                    Notes = Text(e, "notes", where)!,
                    Expression = Expression(Text(e, "expressionBase64", where, optional: true), where),
                    ExpressionName = Text(e, "expressionName", where, optional: true),
                    RecordedJson = Text(e, "recorded", where, optional: true),
                    ContentSha256 = Text(e, "sha256", where)!,
                };
                if (SnapshotContent.Sha256(snap) != snap.ContentSha256)
                    throw new SnapshotException($"{where}: the content does not match its sha256; the file was altered after export.");
                result.Add(snap);
                index++;
            }
            return result;
        }
    }

    private static string? Text(JsonElement e, string name, string where, bool optional = false)
    {
        if (!e.TryGetProperty(name, out var p) || p.ValueKind == JsonValueKind.Null)
            return optional ? null : throw new SnapshotException($"{where}: {name}: missing.");
        return p.ValueKind == JsonValueKind.String ? p.GetString() : throw new SnapshotException($"{where}: {name}: expected a string.");
    }

    private static string[] Versions(JsonElement e, string where)
    {
        if (!e.TryGetProperty("catalogVersions", out var p) || p.ValueKind != JsonValueKind.Array)
            throw new SnapshotException($"{where}: catalogVersions: expected an array of strings.");
        return p.EnumerateArray().Select(x => x.ValueKind == JsonValueKind.String ? x.GetString()!
            : throw new SnapshotException($"{where}: catalogVersions: expected an array of strings.")).ToArray();
    }

    private static DateTimeOffset Created(string text, string where) =>
        DateTimeOffset.TryParse(text, CultureInfo.InvariantCulture, DateTimeStyles.RoundtripKind, out var t) ? t
            : throw new SnapshotException($"{where}: createdUtc: '{text}' is not a date and time.");

    private static byte[]? Expression(string? base64, string where)
    {
        if (base64 is null) return null;
        var buffer = new byte[base64.Length];
        return Convert.TryFromBase64String(base64, buffer, out var n) ? buffer[..n]
            : throw new SnapshotException($"{where}: expressionBase64: not valid base64.");
    }
}
