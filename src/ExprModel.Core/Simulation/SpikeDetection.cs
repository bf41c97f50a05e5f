namespace ExprModel.Core.Simulation;

/// <summary>
/// Spike detection used everywhere (online in the integrator, offline on traces): an upward crossing of
/// <see cref="LevelMv"/> (default -20 mV, common practice) while armed; re-armed once the potential has fallen
/// below the level again and <see cref="RefractoryMs"/> has passed. Spike time is the linearly interpolated crossing.
/// A crossing counts only once the potential falls back below the level within <see cref="MaxWidthMs"/>, so a
/// sustained depolarisation (a passive cell pushed past the level, or depolarisation block) is not a spike.
/// </summary>
public readonly record struct SpikeDetection(double LevelMv = -20, double RefractoryMs = 1.0, double MaxWidthMs = 20)
{
    public static SpikeDetection Default => new(-20, 1.0, 20);
}
