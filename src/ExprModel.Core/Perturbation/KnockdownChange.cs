namespace ExprModel.Core.Perturbation;

/// <summary>
/// How one read-out moves when one target is knocked down: absolute change (in the read-out's unit) and relative
/// change (change / |intact|); both null when either side is undefined. <see cref="Lost"/>: the intact model has the
/// read-out and the knocked-down one does not (e.g. no rheobase once sodium is gone); <see cref="Gained"/> the reverse.
/// </summary>
public sealed record KnockdownChange(string Target, KnockdownKind Kind, string Readout, string Unit, double? Intact, double? KnockedDown)
{
    public double? Change => Intact is { } a && KnockedDown is { } b ? b - a : null;
    public double? RelativeChange => Change is { } d && Intact is { } a && a != 0 ? d / Math.Abs(a) : null;
    public bool Lost => Intact is not null && KnockedDown is null;
    public bool Gained => Intact is null && KnockedDown is not null;
}
