using System.Text.Json;
using ExprModel.Core.Models;
using ExprModel.Data.Store;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>Saves and opens shared snapshots: pins the model, takes its read-outs, and writes it in one transaction.</summary>
/// <param name="maxSnapshotBytes">Largest stored snapshot (model, protocol, read-outs, notes, expression table),
/// <see cref="Hosting.WebOptions.MaxSnapshotMegabytes"/>.</param>
public sealed class SnapshotService(SnapshotStore store, ModelRunner runner, long maxSnapshotBytes = long.MaxValue)
{
    public static readonly JsonSerializerOptions Json = new(JsonSerializerDefaults.Web)
    {
        NumberHandling = System.Text.Json.Serialization.JsonNumberHandling.AllowNamedFloatingPointLiterals,
    };

    /// <summary>For requests: as <see cref="Json"/>, but an unknown field is refused by name (as the model file refuses one), never ignored.</summary>
    public static readonly JsonSerializerOptions StrictJson = new(Json)
    {
        UnmappedMemberHandling = System.Text.Json.Serialization.JsonUnmappedMemberHandling.Disallow,
    };

    public SnapshotStore Store => store;

    /// <param name="recorded">What was recorded from the model's cell or group, stored beside its read-outs.</param>
    public async Task<(Snapshot Snapshot, ReadoutSet Readouts)> SaveAsync(ModelDocument model, SnapshotProtocol protocol, string notes,
        string? parentId, byte[]? expression, string? expressionName, CancellationToken cancel, SnapshotRecorded? recorded = null)
    {
        if (parentId is not null && store.Find(parentId) is null) throw new UserInputException($"parentId: no shared model '{parentId}' exists.");
        var pinned = runner.Pin(model) with { Caution = ResearchCaution.Text };
        var readouts = await runner.ReadoutsAsync(pinned, cancel);
        var versions = pinned.Channels.Select(c => $"{c.Entry}@{c.Version}").Distinct().Order(StringComparer.Ordinal).ToArray();
        var snapshot = new NewSnapshot
        {
            ParentId = parentId,
            ModelJson = pinned.ToJson(),
            CatalogVersions = versions,
            ProtocolJson = JsonSerializer.Serialize(protocol, Json),
            ReadoutsJson = JsonSerializer.Serialize(readouts.Rows, Json),
            Notes = notes,
            Expression = expression,
            ExpressionName = expressionName,
            RecordedJson = recorded is null ? null : JsonSerializer.Serialize(recorded, Json),
        };
        CheckSize(snapshot);
        try
        {
            var snap = store.Save(snapshot);
            return (snap, readouts);
        }
        catch (SnapshotException e)
        {
            throw new UserInputException(e.Message);
        }
    }

    /// <summary>Refuses a snapshot larger than the server stores, naming its largest part (counted as stored: UTF-8 text and raw bytes).</summary>
    private void CheckSize(NewSnapshot s)
    {
        static long Utf8(string? text) => text is null ? 0 : System.Text.Encoding.UTF8.GetByteCount(text);
        (string Part, long Bytes)[] parts =
        [
            ("model", Utf8(s.ModelJson)), ("notes", Utf8(s.Notes)), ("expression", s.Expression?.LongLength ?? 0),
            ("read-outs and protocol", Utf8(s.ReadoutsJson) + Utf8(s.ProtocolJson) + Utf8(s.RecordedJson)),
        ];
        long total = parts.Sum(p => p.Bytes);
        if (total <= maxSnapshotBytes) return;
        var largest = parts.MaxBy(p => p.Bytes);
        throw new UserInputException($"{largest.Part}: the shared model would take {total / (1024.0 * 1024.0):0.##} MB ({largest.Part} "
            + $"{largest.Bytes / (1024.0 * 1024.0):0.##} MB), more than the {maxSnapshotBytes / (1024.0 * 1024.0):0.##} MB this server stores per "
            + $"snapshot ({Hosting.WebOptions.Section}:MaxSnapshotMegabytes). Share without the expression table, or shorten the notes.");
    }

    /// <summary>Opens a snapshot and re-runs its read-outs; null when there is no such snapshot.</summary>
    public async Task<OpenedSnapshot?> OpenAsync(string id, CancellationToken cancel)
    {
        var snap = store.Find(id);
        if (snap is null) return null;
        var model = ModelRunner.Parse(snap.ModelJson, $"snapshot {id}");
        var protocol = JsonSerializer.Deserialize<SnapshotProtocol>(snap.ProtocolJson, Json) ?? new SnapshotProtocol();
        var saved = JsonSerializer.Deserialize<List<ReadoutRow>>(snap.ReadoutsJson, Json) ?? [];
        var rerun = await runner.ReadoutsAsync(model, cancel);
        var recorded = snap.RecordedJson is { } r ? JsonSerializer.Deserialize<SnapshotRecorded>(r, Json) : null;
        return new OpenedSnapshot(snap, model, protocol, saved, rerun.Rows) { Recorded = recorded };
    }
}
