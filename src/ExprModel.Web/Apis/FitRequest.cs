namespace ExprModel.Web.Apis;

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
    [BulkText]
    public string? Recorded { get; init; }
    public string RecordedName { get; init; } = "recorded.csv";
    /// <summary>Instead of <see cref="Targets"/>: recorded sweeps, each an NWB file or a trace table, base64-encoded.</summary>
    [BulkText]
    public IReadOnlyList<RecordingFileDto>? Recordings { get; init; }
    /// <summary>With recorded values: fit to this cell's values ...</summary>
    public string? Cell { get; init; }
    /// <summary>... or to this group's mean (scaled by its recorded SD; default scales below 3 cells).</summary>
    public string? Group { get; init; }
    /// <summary>Cell metadata (CSV or TSV text) holding the group column; default the recorded table.</summary>
    [BulkText]
    public string? Metadata { get; init; }
    public string GroupBy { get; init; } = "group";
    /// <summary>Recorded read-outs to fit (default: those whose recorded definition is the model's).</summary>
    public IReadOnlyList<string>? FitReadouts { get; init; }
}
