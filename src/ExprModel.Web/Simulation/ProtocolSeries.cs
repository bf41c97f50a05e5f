namespace ExprModel.Web.Simulation;

/// <summary>One line of a <see cref="ProtocolPlot"/>.</summary>
public sealed record ProtocolSeries(string Name, double[] X, double[] Y);
