using ExprModel.Web.Simulation;

namespace ExprModel.Web.Apis;

public sealed record SavedModelResponse(string Id, string Link, IReadOnlyList<string> CatalogVersions, IReadOnlyList<ReadoutRow> Readouts, string Caution);
