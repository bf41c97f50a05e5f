namespace ExprModel.Core.Simulation;

/// <summary>Where a run can be taken up again: the integrator's full state at the start of an integration step.</summary>
/// <param name="Step">Index of the next integration step (its start time is Step x dt).</param>
/// <param name="PreviousVoltageMv">V one step earlier (instantaneous gates extrapolate V from it).</param>
public sealed record ResumePoint(int Step, double TimeMs, CellState State, double PreviousVoltageMv);
