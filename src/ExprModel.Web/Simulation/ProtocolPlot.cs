namespace ExprModel.Web.Simulation;

/// <summary>One plot of a protocol run: lines of (x, y) with a name each.</summary>
public sealed record ProtocolPlot(string Key, string Title, string XLabel, string YLabel, IReadOnlyList<ProtocolSeries> Series);
