namespace ExprModel.Web.Apis;

public sealed record CatalogEntrySummary(string Id, int Version, string Name, string Family, string Ion, IReadOnlyList<string> Genes,
    string Citation, string Doi, string Verification, double ReferenceTemperatureC, double Q10, double TypicalDensityMsPerCm2);
