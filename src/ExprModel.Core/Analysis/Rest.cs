using ExprModel.Core.Simulation;

namespace ExprModel.Core.Analysis;

/// <summary>
/// The resting state every read-out protocol starts from, and the steady-state slope conductance at rest that sizes
/// the hyperpolarising steps (a step of deflection x conductance aims at that deflection on a passive membrane).
/// </summary>
public static class Rest
{
    /// <summary>
    /// A cell fires at rest when it spikes in the second half of the settling time at zero current (the first half
    /// lets a model started away from rest reach it).
    /// </summary>
    public static bool FiresAtRest(IReadOnlyList<double> spikeTimesMs, double settleMs) => spikeTimesMs.Any(t => t > settleMs / 2);

    /// <summary>Settles the cell at zero current for <see cref="ReadoutSettings.SettleMs"/>; a cell that fires at rest gets a note.</summary>
    internal static (CellState State, bool FiresAtRest) Settle(CompiledCell cell, ReadoutSettings s, List<string> notes, CancellationToken cancel)
    {
        var settle = Simulator.Run(cell, new NoCurrent(), s.SettleMs, s.Simulation with { RecordEvery = 0 }, null, cancel);
        bool firesAtRest = FiresAtRest(settle.SpikeTimesMs, s.SettleMs);
        if (firesAtRest) notes.Add("The cell fires without input; passive read-outs and rheobase are not defined.");
        return (settle.FinalState, firesAtRest);
    }

    /// <summary>
    /// The steady-state slope conductance at rest (mS/cm2). When it is not positive (a rest on a region of negative
    /// slope) the steps are sized from the total leak conductance instead, and a note says so.
    /// </summary>
    internal static double SlopeConductanceForSteps(CompiledCell cell, double restMv, List<string> notes)
    {
        double gSlope = Passive.SteadySlopeConductance(cell, restMv);
        if (gSlope > 1e-4) return gSlope;
        notes.Add($"Steady-state slope conductance at rest is {gSlope:G3} mS/cm2 (not positive); passive steps sized from total leak instead.");
        return Math.Max(1e-3, cell.Model.Channels.Where(c => c.Entry.Gates.Count == 0).Sum(c => c.EffectiveDensityMsPerCm2));
    }
}
