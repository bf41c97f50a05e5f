namespace ExprModel.Web.Apis;

public sealed record KnockdownRow(string Readout, string Unit, string Target, string Kind, double? Intact, double? KnockedDown, double? Change,
    double? RelativeChange, bool Lost);
