namespace ExprModel.Core.Simulation;

/// <summary>One stimulus's result in a sweep: its spike times and, when asked for, a resume point shortly before its first spike.</summary>
public sealed record SweepLane(IReadOnlyList<double> SpikeTimesMs, ResumePoint? BeforeFirstSpike);
