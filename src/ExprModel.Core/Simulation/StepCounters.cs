namespace ExprModel.Core.Simulation;

/// <summary>
/// Integration steps taken since the process started, counted once per run (not per step): SIMD groups (four lanes each,
/// however many are used) and scalar-loop runs. Read by the batch benchmark's stage profile, where step counts, unlike
/// times, do not depend on what else the machine is doing.
/// </summary>
internal static class StepCounters
{
    private static long _simdGroupSteps, _scalarSteps;

    public static long SimdGroupSteps => Interlocked.Read(ref _simdGroupSteps);
    public static long ScalarSteps => Interlocked.Read(ref _scalarSteps);

    public static void AddSimd(long steps) => Interlocked.Add(ref _simdGroupSteps, steps);
    public static void AddScalar(long steps) => Interlocked.Add(ref _scalarSteps, steps);
}
