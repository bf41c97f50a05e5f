using System.Text.Json;
using ExprModel.Core.Models;
using ExprModel.Data.Store;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>Saves and opens shared snapshots: pins the model, takes its read-outs, and writes it in one transaction.</summary>
public sealed class SnapshotService(SnapshotStore store, ModelRunner runner)
{
    public static readonly JsonSerializerOptions Json = new(JsonSerializerDefaults.Web)
    {
        NumberHandling = System.Text.Json.Serialization.JsonNumberHandling.AllowNamedFloatingPointLiterals,
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
        try
        {
            var snap = store.Save(new NewSnapshot
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
            });
            return (snap, readouts);
        }
        catch (SnapshotException e)
        {
            throw new UserInputException(e.Message);
        }
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
