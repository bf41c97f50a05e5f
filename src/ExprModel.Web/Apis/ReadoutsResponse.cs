using ExprModel.Web.Simulation;

namespace ExprModel.Web.Apis;

public sealed record ReadoutsResponse(IReadOnlyList<ReadoutRow> Readouts, IReadOnlyList<string> Notes, string Caution);
