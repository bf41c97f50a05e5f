using ExprModel.Core.Mapping;

namespace ExprModel.Web.Apis;

/// <summary>A build request: the table (and optional metadata) as text, the target, the read choices, overrides and rule.</summary>
public sealed record BuildRequest
{
    /// <summary>The expression table as CSV or TSV text (genes x cells or cells x genes).</summary>
    public string? Expression { get; init; }
    public string ExpressionName { get; init; } = "expression.csv";
    public string? Metadata { get; init; }
    public string MetadataName { get; init; } = "metadata.csv";
    public string? GroupBy { get; init; }
    public string? Group { get; init; }
    public string? Cell { get; init; }
    /// <summary>genes-as-rows or cells-as-rows; absent = detect.</summary>
    public string? Orientation { get; init; }
    /// <summary>counts, cpm, tpm, fpkm or log-transformed; absent = detect.</summary>
    public string? Unit { get; init; }
    public IReadOnlyList<GeneOverride>? Overrides { get; init; }
    public string? ReferenceGroup { get; init; }
    public double Exponent { get; init; } = 1;
    public bool Clamp { get; init; } = true;
    public double CapacitancePf { get; init; } = ModelDefaults.CapacitancePf;
    public double TemperatureC { get; init; } = ModelDefaults.TemperatureC;
}
