namespace ExprModel.Web.Workspace;

/// <summary>One setting of a protocol form: its key in <see cref="InjectedProtocol.Values"/>, label, unit, default and bounds.</summary>
public sealed record ProtocolField(string Key, string Label, string Unit, double Default, double Min, double Max, bool Whole = false);
