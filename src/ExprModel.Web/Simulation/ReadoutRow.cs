namespace ExprModel.Web.Simulation;

/// <summary>One read-out as the tables, CSV files and snapshots carry it.</summary>
public sealed record ReadoutRow(string Name, string Unit, double? Value);
