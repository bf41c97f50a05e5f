using System.Collections.Concurrent;
using System.Runtime.CompilerServices;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The stretch at zero current that every lane of a sweep of steps runs before its step comes on (the 100 ms baseline of
/// the read-out protocols), computed once per starting state and shared by every sweep that starts there: the rheobase
/// search's rounds, the f-I curve, the sustained-firing search and the adaptation step of one cell all begin with the
/// same 4,000 steps from the same rest. Lanes of the SIMD kernel are computed independently, so a sweep started from the
/// shared baseline gives bit for bit what it gives from step 0. Kept while the starting state object lives.
/// </summary>
internal static class SweepBaselines
{
    private static readonly AsyncLocal<bool> Off = new();

    /// <summary>
    /// Lets tests compare sweeps with and without the shared baseline. Per logical call flow (AsyncLocal, which
    /// Parallel.For carries to its workers), so tests running at the same time do not switch each other.
    /// </summary>
    internal static bool Enabled
    {
        get => !Off.Value;
        set => Off.Value = !value;
    }

    /// <summary>Shorter shared stretches are not worth a cache entry (steps).</summary>
    private const int MinimumSteps = SweepKernel.CheckpointEverySteps;

    private static readonly ConditionalWeakTable<CellState, ConcurrentDictionary<(CompiledCell Cell, double DtMs, int Steps, SpikeDetection Spikes),
        Lazy<SweepStart?>>> ByStart = new();

    /// <summary>
    /// The shared baseline for these stimuli from <paramref name="initial"/>, when every stimulus is a step without holding
    /// current (or no current) and the steps come on late enough; null otherwise, or when the baseline crossed the spike
    /// detection level or ran out of range (the sweep then runs from step 0).
    /// </summary>
    public static SweepStart? For(CompiledCell cell, RateTable table, IReadOnlyList<Stimulus> stimuli, int steps, SimulationSettings settings,
        CellState initial, CancellationToken cancel)
    {
        if (!Enabled) return null;
        int shared = steps;
        foreach (var stimulus in stimuli)
        {
            if (stimulus is NoCurrent) continue;
            if (stimulus is not StepCurrent { HoldingUaPerCm2: 0 } step) return null;
            shared = Math.Min(shared, step.OnRange(settings.DtMs, steps).First);
        }
        if (shared < MinimumSteps) return null;
        var byKey = ByStart.GetValue(initial, _ => new());
        var lazy = byKey.GetOrAdd((cell, settings.DtMs, shared, settings.Spikes),
            k => new Lazy<SweepStart?>(() => SweepKernel.Baseline(cell, table, k.Steps, settings, initial, CancellationToken.None)));
        cancel.ThrowIfCancellationRequested();
        return lazy.Value;
    }
}
