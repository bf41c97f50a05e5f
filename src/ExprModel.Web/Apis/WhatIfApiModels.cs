using ExprModel.Core.Perturbation;

namespace ExprModel.Web.Apis;

/// <summary>Knock-down request: every channel (or, with <see cref="Genes"/>, every gene) at <see cref="Level"/> of its density or expression.</summary>
public sealed record KnockdownRequest : ModelRequest
{
    public double Level { get; init; }
    public bool Genes { get; init; }
    /// <summary>Only this read-out, ranked (which genes or entries set it).</summary>
    public string? Readout { get; init; }
}

public sealed record KnockdownRow(string Readout, string Unit, string Target, string Kind, double? Intact, double? KnockedDown, double? Change, double? RelativeChange, bool Lost);

public sealed record KnockdownResponse(double Level, IReadOnlyList<KnockdownRow> Changes, IReadOnlyDictionary<string, string> Failures, string Caution);

public sealed record SensitivityRequest : ModelRequest
{
    /// <summary>Step in ln(density); default ln 1.2.</summary>
    public double? StepLn { get; init; }
}

/// <summary>The matrix as heat-map data: <see cref="Values"/>[channel][read-out]; <see cref="Kinds"/> says which columns are log ratios.</summary>
public sealed record SensitivityResponse(IReadOnlyList<string> Channels, IReadOnlyList<string> Readouts, IReadOnlyList<string> EntryUnits, IReadOnlyList<string> Kinds,
    IReadOnlyList<string> Quantisation, double?[][] Values, double StepLn, IReadOnlyList<string> Notes, string Caution);

public sealed record FitTargetDto(string Readout, double Value, string? Unit = null, double? Scale = null);

public sealed record FitRequest : ModelRequest
{
    public IReadOnlyList<FitTargetDto>? Targets { get; init; }
    /// <summary>Width of the prior in ln(relative density); default ln 2. Ignored with <see cref="NoPrior"/>.</summary>
    public double? PriorWidth { get; init; }
    public bool NoPrior { get; init; }
    public int Starts { get; init; } = 1;
    public int Seed { get; init; } = 1;
    /// <summary>"lm" (Levenberg-Marquardt, default) or "simplex".</summary>
    public string? Optimiser { get; init; }
    /// <summary>Instead of <see cref="Targets"/>: a recorded-features table as CSV or TSV text (units in the headers).</summary>
    public string? Recorded { get; init; }
    public string RecordedName { get; init; } = "recorded.csv";
    /// <summary>Instead of <see cref="Targets"/>: recorded sweeps, each an NWB file or a trace table, base64-encoded.</summary>
    public IReadOnlyList<RecordingFileDto>? Recordings { get; init; }
    /// <summary>With recorded values: fit to this cell's values ...</summary>
    public string? Cell { get; init; }
    /// <summary>... or to this group's mean (scaled by its recorded SD; default scales below 3 cells).</summary>
    public string? Group { get; init; }
    /// <summary>Cell metadata (CSV or TSV text) holding the group column; default the recorded table.</summary>
    public string? Metadata { get; init; }
    public string GroupBy { get; init; } = "group";
    /// <summary>Recorded read-outs to fit (default: those whose recorded definition is the model's).</summary>
    public IReadOnlyList<string>? FitReadouts { get; init; }
}

/// <param name="Name">File name with its extension (.nwb, .csv, .tsv or .txt).</param>
public sealed record RecordingFileDto(string Name, string ContentBase64);

/// <summary>One channel of a fit; <see cref="DataSdLn"/> is null when the data leave it free altogether (or it was fixed).</summary>
public sealed record FitChannelRow(string Channel, double StartRelative, double FittedRelative, double FoldChange, bool Fixed, bool Pinned, double? DataSdLn, bool AtBound)
{
    public static FitChannelRow From(FitChannel c) =>
        new(c.Channel, c.StartRelative, c.FittedRelative, c.FoldChange, c.Fixed, c.Pinned, double.IsFinite(c.DataSdLn) ? c.DataSdLn : null, c.AtBound);
}

public sealed record FitResponse(System.Text.Json.JsonElement Model, IReadOnlyList<FitChannelRow> Channels, IReadOnlyList<FitResidual> Residuals,
    IReadOnlyList<double> SingularValues, IReadOnlyList<string> Directions, IReadOnlyList<bool> DirectionPinned, double ObjectiveBefore, double ObjectiveAfter,
    int Evaluations, string Summary, string Caution)
{
    /// <summary>How targets taken from recorded values were made (empty for typed targets).</summary>
    public IReadOnlyList<string> TargetNotes { get; init; } = [];
}
