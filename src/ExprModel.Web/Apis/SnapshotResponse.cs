using System.Text.Json;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Apis;

public sealed record SnapshotResponse(string Id, string? ParentId, DateTimeOffset CreatedUtc, JsonElement Model, IReadOnlyList<string> CatalogVersions,
    SnapshotProtocol Protocol, IReadOnlyList<ReadoutRow> Readouts, string Notes, bool HasExpression, string Caution);
