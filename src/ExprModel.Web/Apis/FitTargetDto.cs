namespace ExprModel.Web.Apis;

public sealed record FitTargetDto(string Readout, double Value, string? Unit = null, double? Scale = null);
