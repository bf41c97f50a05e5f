namespace ExprModel.Core.Simulation;

/// <summary>
/// Integration steps taken since the process started, counted once per run (not per step): SIMD groups (four lanes each,
/// however many are used) and scalar-loop runs. Read by the batch benchmark's stage profile, where step counts, unlike
/// times, do not depend on what else the machine is doing.
/// </summary>
internal static class StepCounters
{
    private static long _simdGroupSteps, _scalarSteps, _simdLaneSteps, _simdRuns;

    public static long SimdGroupSteps => Interlocked.Read(ref _simdGroupSteps);
    public static long ScalarSteps => Interlocked.Read(ref _scalarSteps);

    /// <summary>
    /// Lane steps actually used (steps x lanes of each run) and SIMD group runs: with <see cref="SimdGroupSteps"/> they
    /// show how full the groups are.
    /// </summary>
    public static long SimdLaneSteps => Interlocked.Read(ref _simdLaneSteps);
    public static long SimdRuns => Interlocked.Read(ref _simdRuns);

    public static void AddSimd(long steps, int lanes)
    {
        Interlocked.Add(ref _simdGroupSteps, steps);
        Interlocked.Add(ref _simdLaneSteps, steps * lanes);
        Interlocked.Increment(ref _simdRuns);
    }
    public static void AddScalar(long steps) => Interlocked.Add(ref _scalarSteps, steps);
}
