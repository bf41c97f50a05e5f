using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>A pinned set of Workbench results (a slider setting or a group's model) drawn beside the live one.</summary>
public sealed record Variant(string Name, string Color, StepView Step, IReadOnlyList<FiRow>? Fi, IReadOnlyList<ReadoutRow> Readouts);
