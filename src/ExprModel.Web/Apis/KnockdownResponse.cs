namespace ExprModel.Web.Apis;

public sealed record KnockdownResponse(double Level, IReadOnlyList<KnockdownRow> Changes, IReadOnlyDictionary<string, string> Failures, string Caution);
