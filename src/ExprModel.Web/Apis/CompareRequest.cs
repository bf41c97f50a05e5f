using ExprModel.Core.Mapping;

namespace ExprModel.Web.Apis;

/// <summary>A compare request: a build request's inputs, the recorded table (default: the metadata) and how to compare.</summary>
public sealed record CompareRequest
{
    public string? Expression { get; init; }
    public string ExpressionName { get; init; } = "expression.csv";
    public string? Metadata { get; init; }
    public string MetadataName { get; init; } = "metadata.csv";
    public string? GroupBy { get; init; }
    /// <summary>Per-cell recorded values with units in the headers, as CSV or TSV text; absent = the metadata table.</summary>
    public string? Recorded { get; init; }
    public string RecordedName { get; init; } = "recorded.csv";
    /// <summary>Cell id column of the recorded table; absent = a column named like a cell id.</summary>
    public string? RecordedCellColumn { get; init; }
    /// <summary>Column (header, or header without its unit) to read-out name, or to "none".</summary>
    public IReadOnlyDictionary<string, string>? Map { get; init; }
    /// <summary>cell (each recorded cell's own model) or group (its group's model).</summary>
    public string Per { get; init; } = "cell";
    /// <summary>Per-cell models: group (gamma-Poisson shrinkage towards the cell's group) or none.</summary>
    public string Shrink { get; init; } = "group";
    public string? Orientation { get; init; }
    public string? Unit { get; init; }
    public IReadOnlyList<GeneOverride>? Overrides { get; init; }
    public string? ReferenceGroup { get; init; }
    public double Exponent { get; init; } = 1;
    public bool Clamp { get; init; } = true;
    public double CapacitancePf { get; init; } = ModelDefaults.CapacitancePf;
    public double TemperatureC { get; init; } = ModelDefaults.TemperatureC;
}
