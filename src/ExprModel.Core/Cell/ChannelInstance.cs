using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Cell;

/// <summary>One channel entry placed in a cell at a density.</summary>
public sealed record ChannelInstance
{
    public required ChannelEntry Entry { get; init; }
    /// <summary>Maximal conductance density predicted or chosen for this cell (mS/cm2), before the relative density scales it.</summary>
    public required double DensityMsPerCm2 { get; init; }
    /// <summary>The factor the user scales the density by (a knock-down below 1, over-expression above); 1 = as predicted.</summary>
    public double RelativeDensity { get; init; } = 1;
    /// <summary>Overrides the entry's reversal rule with a fixed reversal (mV), as a published model does.</summary>
    public double? ReversalMv { get; init; }
    /// <summary>Shifts every gate of this channel along the voltage axis by this amount (mV).</summary>
    public double ShiftMv { get; init; }
    /// <summary>Multiplies every gate time constant of this channel (a published model's fitted slowing, e.g. tau_max of an M-current).</summary>
    public double TauScale { get; init; } = 1;

    public double EffectiveDensityMsPerCm2 => DensityMsPerCm2 * RelativeDensity;
}
