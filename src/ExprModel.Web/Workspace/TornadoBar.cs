namespace ExprModel.Web.Workspace;

/// <summary>
/// One bar of a tornado plot: the target knocked down and how far it moved the read-out (null when the read-out is
/// undefined on either side: then <see cref="Lost"/> or <see cref="Gained"/> says which way), with the values behind it.
/// </summary>
public sealed record TornadoBar(string Target, double? Value, bool Lost, bool Gained, double? Intact, double? KnockedDown);
