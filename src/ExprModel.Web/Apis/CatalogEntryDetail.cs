namespace ExprModel.Web.Apis;

public sealed record CatalogEntryDetail(CatalogEntrySummary Entry, IReadOnlyList<int> Versions, string Preparation, string CuratorNote,
    string Reversal, double? ReversalMv, double MinDensityMsPerCm2, double MaxDensityMsPerCm2, string Location, double AtTemperatureC,
    IReadOnlyList<GateCurveSet> Curves, IReadOnlyList<GateFormTable> GateForms, int ParameterCount);
