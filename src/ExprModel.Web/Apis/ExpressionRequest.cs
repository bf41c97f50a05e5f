using ExprModel.Core.Mapping;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Apis;

/// <summary>
/// What every request that builds models from an expression table carries: the table (and optional metadata) as text,
/// the read choices, gene overrides and the density rule. The build and compare routes add their own fields.
/// </summary>
public abstract record ExpressionRequest
{
    /// <summary>The expression table as CSV or TSV text (genes x cells or cells x genes).</summary>
    [BulkText]
    public string? Expression { get; init; }
    public string ExpressionName { get; init; } = "expression.csv";
    [BulkText]
    public string? Metadata { get; init; }
    public string MetadataName { get; init; } = "metadata.csv";
    public string? GroupBy { get; init; }
    /// <summary>genes-as-rows or cells-as-rows; absent = detect.</summary>
    public string? Orientation { get; init; }
    /// <summary>counts, cpm, tpm, fpkm or log-transformed; absent = detect.</summary>
    public string? Unit { get; init; }
    /// <summary>For an .h5ad table: X, layer:NAME or raw (the AnnData matrix to read); absent = X.</summary>
    public string? Matrix { get; init; }
    public IReadOnlyList<GeneOverride>? Overrides { get; init; }
    public string? ReferenceGroup { get; init; }
    public double Exponent { get; init; } = 1;
    public bool Clamp { get; init; } = true;
    public double CapacitancePf { get; init; } = ModelDefaults.CapacitancePf;
    public double TemperatureC { get; init; } = ModelDefaults.TemperatureC;

    /// <summary>The form fields every such request takes besides its file parts.</summary>
    internal static readonly string[] CommonFormFields =
    [
        "expression", "metadata", "groupBy", "orientation", "unit", "matrix", "referenceGroup", "exponent", "clamp", "capacitancePf", "temperatureC",
        "overrides",
    ];

    internal ReadChoices ReadChoices() => new(Orientation, Unit, GroupBy, Matrix);

    /// <exception cref="UserInputException">The rule is not usable (the library's reason).</exception>
    internal DensityRule DensityRule()
    {
        var rule = Core.Mapping.DensityRule.RelativeTo(ReferenceGroup) with
        {
            Exponent = Exponent,
            ClampToPlausibleRange = Clamp,
            CapacitancePf = CapacitancePf,
            TemperatureC = TemperatureC,
        };
        if (rule.Problem() is { } problem) throw new UserInputException("density rule: " + problem);
        return rule;
    }

    /// <summary><paramref name="request"/> with the common fields read from a multipart form (absent fields keep its values).</summary>
    internal static T WithCommonFields<T>(T request, MultipartForm form) where T : ExpressionRequest => (T)((ExpressionRequest)request with
    {
        GroupBy = BuildApi.Text(form, "groupBy"),
        Orientation = BuildApi.Text(form, "orientation"),
        Unit = BuildApi.Text(form, "unit"),
        Matrix = BuildApi.Text(form, "matrix"),
        ReferenceGroup = BuildApi.Text(form, "referenceGroup"),
        Exponent = BuildApi.Number(form, "exponent") ?? request.Exponent,
        Clamp = BuildApi.Flag(form, "clamp") ?? request.Clamp,
        CapacitancePf = BuildApi.Number(form, "capacitancePf") ?? request.CapacitancePf,
        TemperatureC = BuildApi.Number(form, "temperatureC") ?? request.TemperatureC,
        Overrides = BuildApi.Overrides(form),
    });
}
