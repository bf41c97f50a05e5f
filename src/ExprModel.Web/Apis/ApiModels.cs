using System.Text.Json;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Apis;

/// <summary>A request that carries a model file (the app's own JSON model format) as a JSON object.</summary>
public abstract record ModelRequest
{
    /// <summary>The model file as a JSON object (format "exprmodel-model").</summary>
    public JsonElement? Model { get; init; }

    internal ModelDocument ReadModel()
    {
        if (Model is not { ValueKind: JsonValueKind.Object } m) throw new UserInputException("model: required, as a JSON object in the model-file format.");
        return ModelRunner.Parse(m.GetRawText(), "request body, field 'model'");
    }

    internal static JsonElement ToElement(ModelDocument doc) => JsonDocument.Parse(doc.ToJson()).RootElement.Clone();
}

public sealed record SimulateRequest : ModelRequest
{
    public StepProtocol? Step { get; init; }
}

public sealed record FiRequest : ModelRequest
{
    public FiProtocol? Fi { get; init; }
}

public sealed record ReadoutsRequest : ModelRequest;

public sealed record SaveModelRequest : ModelRequest
{
    public string? Notes { get; init; }
    /// <summary>The snapshot this one was made by editing.</summary>
    public string? ParentId { get; init; }
    public SnapshotProtocol? Protocol { get; init; }
    /// <summary>The raw expression table, stored only when given here (the user asked for it).</summary>
    public string? Expression { get; init; }
    public string? ExpressionName { get; init; }
}

public sealed record SimulateResponse(double[] TimeMs, double[] VoltageMv, double[] StimulusUaPerCm2, IReadOnlyList<double> SpikeTimesMs, string Caution);
public sealed record FiResponse(IReadOnlyList<FiRow> Points, string Caution);
public sealed record ReadoutsResponse(IReadOnlyList<ReadoutRow> Readouts, IReadOnlyList<string> Notes, string Caution);
public sealed record SavedModelResponse(string Id, string Link, IReadOnlyList<string> CatalogVersions, IReadOnlyList<ReadoutRow> Readouts, string Caution);
public sealed record SnapshotResponse(string Id, string? ParentId, DateTimeOffset CreatedUtc, JsonElement Model, IReadOnlyList<string> CatalogVersions,
    SnapshotProtocol Protocol, IReadOnlyList<ReadoutRow> Readouts, string Notes, bool HasExpression, string Caution);

public sealed record CatalogEntrySummary(string Id, int Version, string Name, string Family, string Ion, IReadOnlyList<string> Genes,
    string Citation, string Doi, string Verification, double ReferenceTemperatureC, double Q10, double TypicalDensityMsPerCm2);
public sealed record GateCurveSet(string Gate, int Power, double[] VoltageMv, double[] SteadyState, double[] TimeConstantMs);
public sealed record CatalogEntryDetail(CatalogEntrySummary Entry, IReadOnlyList<int> Versions, string Preparation, string CuratorNote,
    string Reversal, double? ReversalMv, double MinDensityMsPerCm2, double MaxDensityMsPerCm2, string Location, double AtTemperatureC,
    IReadOnlyList<GateCurveSet> Curves);
