using System.Text.Json;
using System.Text.Json.Nodes;
using System.Text.Json.Serialization;
using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Models;

/// <summary>
/// ExprModel's own model file: a JSON document with a format tag and schema version that pins every catalog
/// entry by id and version. Documented in DEVELOPERS.md ("Model file").
/// </summary>
public sealed record ModelDocument
{
    public const string FormatTag = "exprmodel-model";
    public const int CurrentSchemaVersion = 1;

    public string Format { get; init; } = FormatTag;
    public int SchemaVersion { get; init; } = CurrentSchemaVersion;
    public string Name { get; init; } = "model";
    public string Description { get; init; } = "";
    /// <summary>For published models: the paper the whole model comes from.</summary>
    public string Citation { get; init; } = "";
    public required CellGeometryDocument Cell { get; init; }
    public double TemperatureC { get; init; } = 36;
    public double InitialVoltageMv { get; init; } = -65;
    public IonConcentrations? Ions { get; init; }
    public CalciumShell? CalciumShell { get; init; }
    /// <summary>Optional; a model with a sodium-gated channel and no sodiumShell gets the default shell.</summary>
    public SodiumShell? SodiumShell { get; init; }
    public required IReadOnlyList<ChannelDocument> Channels { get; init; }
    /// <summary>How the densities were derived (expression rule, reference, inputs); free-form but always kept.</summary>
    public JsonObject? Derivation { get; init; }
    public string Notes { get; init; } = "";
    /// <summary>Written on every export (research-use caution).</summary>
    public string? Caution { get; init; }

    public static JsonSerializerOptions JsonOptions { get; } = CreateOptions();

    private static JsonSerializerOptions CreateOptions()
    {
        var o = new JsonSerializerOptions(JsonSerializerDefaults.Web)
        {
            WriteIndented = true,
            DefaultIgnoreCondition = JsonIgnoreCondition.WhenWritingNull,
            UnmappedMemberHandling = JsonUnmappedMemberHandling.Disallow,
            AllowTrailingCommas = false,
            ReadCommentHandling = JsonCommentHandling.Skip,
            Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
        };
        o.Converters.Add(new JsonStringEnumConverter(JsonNamingPolicy.KebabCaseLower));
        return o;
    }

    /// <summary>Parses a model file; errors name the file, line and JSON path.</summary>
    public static ModelDocument Parse(string json, string fileName = "model.json")
    {
        ModelDocument? doc;
        try
        {
            doc = JsonSerializer.Deserialize<ModelDocument>(json, JsonOptions);
        }
        catch (JsonException e)
        {
            throw new ModelFileException(JsonErrorMessage.For(e, fileName));
        }
        if (doc is null) throw new ModelFileException($"{fileName}: the file holds no model (null).");
        if (doc.Format != FormatTag) throw new ModelFileException($"{fileName}: field 'format' must be \"{FormatTag}\" (got \"{doc.Format}\").");
        if (doc.SchemaVersion != CurrentSchemaVersion)
            throw new ModelFileException($"{fileName}: schemaVersion {doc.SchemaVersion} is not supported (this program reads {CurrentSchemaVersion}).");
        if (doc.Channels is null || doc.Channels.Count == 0) throw new ModelFileException($"{fileName}: 'channels' must list at least one channel.");
        if (doc.Cell is null) throw new ModelFileException($"{fileName}: 'cell' is required.");
        for (int i = 0; i < doc.Channels.Count; i++)
        {
            var c = doc.Channels[i];
            if (string.IsNullOrWhiteSpace(c.Entry)) throw new ModelFileException($"{fileName}: channels[{i}].entry is missing.");
            if (!(c.DensityMsPerCm2 >= 0) || double.IsInfinity(c.DensityMsPerCm2))
                throw new ModelFileException($"{fileName}: channels[{i}] ({c.Entry}).densityMsPerCm2 must be a number >= 0.");
            if (!(c.RelativeDensity >= 0) || double.IsInfinity(c.RelativeDensity))
                throw new ModelFileException($"{fileName}: channels[{i}] ({c.Entry}).relativeDensity must be a number >= 0.");
        }
        return doc;
    }

    public string ToJson() => JsonSerializer.Serialize(this, JsonOptions);

    /// <summary>Builds the simulatable cell, resolving each channel's entry (id, pinned version or latest).</summary>
    public CellModel ToCellModel(Func<string, int?, ChannelEntry> resolve)
    {
        var channels = new List<ChannelInstance>();
        foreach (var c in Channels)
        {
            var entry = resolve(c.Entry, c.Version);
            channels.Add(new ChannelInstance
            {
                Entry = entry,
                DensityMsPerCm2 = c.DensityMsPerCm2,
                RelativeDensity = c.RelativeDensity,
                ReversalMv = c.ReversalMv,
                ShiftMv = c.ShiftMv,
                TauScale = c.TauScale,
            });
        }
        return new CellModel
        {
            Name = Name,
            Geometry = Cell.ToGeometry(),
            TemperatureC = TemperatureC,
            Ions = Ions ?? IonConcentrations.Mammalian,
            CalciumShell = CalciumShell,
            SodiumShell = SodiumShell,
            Channels = channels,
            InitialVoltageMv = InitialVoltageMv,
        };
    }

    /// <summary>The same document with every channel pinned to the version <paramref name="resolve"/> gives.</summary>
    public ModelDocument Pinned(Func<string, int?, ChannelEntry> resolve) =>
        this with { Channels = Channels.Select(c => c with { Version = resolve(c.Entry, c.Version).Version }).ToArray() };

    /// <summary>The same document with relative densities set from a map of entry id to relative density (1 = as predicted).</summary>
    public ModelDocument WithRelativeDensities(IReadOnlyDictionary<string, double> relative) =>
        this with { Channels = Channels.Select(c => relative.TryGetValue(c.Entry, out var r) ? c with { RelativeDensity = r } : c).ToArray() };
}
