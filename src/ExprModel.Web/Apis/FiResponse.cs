using ExprModel.Web.Simulation;

namespace ExprModel.Web.Apis;

public sealed record FiResponse(IReadOnlyList<FiRow> Points, string Caution);
