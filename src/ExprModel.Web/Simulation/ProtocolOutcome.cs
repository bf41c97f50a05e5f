namespace ExprModel.Web.Simulation;

/// <summary>What a protocol run shows: a one-line summary, its plots and its CSV file (which carries the research-use caution).</summary>
public sealed record ProtocolOutcome(string Summary, IReadOnlyList<ProtocolPlot> Plots, string CsvName, string CsvText);
