namespace ExprModel.Web.Apis;

/// <summary>The multipart form of a build request, as the OpenAPI document describes it (the endpoint reads the parts itself).</summary>
public sealed record BuildForm
{
    /// <summary>
    /// The expression table file: CSV or TSV (optionally gzip) or AnnData .h5ad; or, as this field repeated, a Matrix Market
    /// matrix with its genes (features) and barcodes files; or one .zip or .tar.gz archive holding them.
    /// </summary>
    public required IFormFile Expression { get; init; }
    /// <summary>Cell metadata file (cell id column plus label columns), needed with group.</summary>
    public IFormFile? Metadata { get; init; }
    public string? GroupBy { get; init; }
    public string? Group { get; init; }
    public string? Cell { get; init; }
    public string? Orientation { get; init; }
    public string? Unit { get; init; }
    public string? ReferenceGroup { get; init; }
    public double? Exponent { get; init; }
    public bool? Clamp { get; init; }
    public double? CapacitancePf { get; init; }
    public double? TemperatureC { get; init; }
    /// <summary>A JSON array of overrides, as in the JSON body.</summary>
    public string? Overrides { get; init; }
}
