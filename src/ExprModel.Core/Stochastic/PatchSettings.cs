using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// A voltage-clamped patch: <see cref="ChannelCount"/> channels of one entry, held at <see cref="HoldingMv"/>, stepped to
/// <see cref="StepMv"/> for <see cref="StepMs"/> after <see cref="PreStepMs"/>, then back to holding for
/// <see cref="PostStepMs"/>; <see cref="Sweeps"/> independent sweeps. Channels start each sweep from the stationary
/// occupancy at the holding potential.
/// </summary>
public sealed record PatchSettings
{
    public const int MaxChannels = 10_000;
    public const int MaxSweeps = 100_000;

    public required ChannelEntry Entry { get; init; }
    /// <summary>Unitary conductance of one open channel (pS).</summary>
    public required double UnitaryConductancePs { get; init; }
    public int ChannelCount { get; init; } = 10;
    public double HoldingMv { get; init; } = -90;
    public double StepMv { get; init; } = 0;
    public double PreStepMs { get; init; } = 5;
    public double StepMs { get; init; } = 50;
    public double PostStepMs { get; init; }
    public int Sweeps { get; init; } = 100;
    /// <summary>Temperature (deg C); null = the entry's own reference temperature.</summary>
    public double? TemperatureC { get; init; }
    /// <summary>Intracellular calcium (mM) at which calcium gates are held.</summary>
    public double CalciumMm { get; init; } = 5e-5;
    /// <summary>Reversal potential (mV); null = the entry's rule with mammalian ion concentrations.</summary>
    public double? ReversalMv { get; init; }
    public double SampleIntervalMs { get; init; } = 0.05;
    /// <summary>How many single sweeps are kept as records (all sweeps enter the ensemble statistics).</summary>
    public int KeptSweeps { get; init; } = 10;
    /// <summary>Dwell times are collected from this many sweeps at most (each channel's dwells inside the step).</summary>
    public int DwellSweeps { get; init; } = 200;
    public long Seed { get; init; } = 1;

    public double EffectiveTemperatureC => TemperatureC ?? Entry.ReferenceTemperatureC;
    public double TotalMs => PreStepMs + StepMs + PostStepMs;

    /// <summary>The reversal potential used: the given one, or the entry's rule in a mammalian cell at this temperature.</summary>
    public double EffectiveReversalMv() => ReversalMv ?? new CellModel
    {
        Geometry = new Geometry { AreaUm2 = 1000 },
        TemperatureC = EffectiveTemperatureC,
        Channels = [],
    }.ReversalPotentialMv(new ChannelInstance { Entry = Entry, DensityMsPerCm2 = 0 });

    /// <summary>The first problem, naming the setting, or null.</summary>
    public string? Problem()
    {
        if (Entry.Problem() is { } p) return p;
        if (Entry.Gates.Count == 0) return $"{Entry.Key}: the entry has no gates, so its channels never close (nothing to simulate)";
        if (Entry.Gates.All(g => g.Instantaneous)) return $"{Entry.Key}: every gate is instantaneous, so the channel has no kinetic states";
        if (ChannelCount < 1 || ChannelCount > MaxChannels) return $"channels: must be 1 to {MaxChannels} (got {ChannelCount})";
        if (Sweeps < 1 || Sweeps > MaxSweeps) return $"sweeps: must be 1 to {MaxSweeps} (got {Sweeps})";
        if (!(UnitaryConductancePs > 0) || double.IsInfinity(UnitaryConductancePs))
            return $"unitary conductance: must be positive pS (got {UnitaryConductancePs})";
        if (!double.IsFinite(HoldingMv) || Math.Abs(HoldingMv) > 200) return $"holding: must lie within +-200 mV (got {HoldingMv})";
        if (!double.IsFinite(StepMv) || Math.Abs(StepMv) > 200) return $"step: must lie within +-200 mV (got {StepMv})";
        if (!(PreStepMs >= 0) || !(StepMs > 0) || !(PostStepMs >= 0) || TotalMs > 10_000)
            return $"durations: pre-step >= 0, step > 0, post-step >= 0 ms, at most 10000 ms in all (got {PreStepMs}, {StepMs}, {PostStepMs})";
        if (!(SampleIntervalMs > 0) || TotalMs / SampleIntervalMs > 200_000)
            return $"sample interval: must be positive and give at most 200000 samples (got {SampleIntervalMs} ms)";
        if (!(CalciumMm >= 0) || double.IsInfinity(CalciumMm)) return $"calcium: must be >= 0 mM (got {CalciumMm})";
        if (KeptSweeps < 0 || DwellSweeps < 0) return "kept sweeps and dwell sweeps must be >= 0";
        return null;
    }
}
