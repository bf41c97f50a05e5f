namespace ExprModel.Core.Simulation;

/// <summary>Settings of one simulation run.</summary>
public sealed record SimulationSettings
{
    /// <summary>Fixed step (ms); 25 us is common practice for single compartments.</summary>
    public double DtMs { get; init; } = 0.025;
    /// <summary>Keep every Nth sample in the recorded trace (0 = record nothing but spikes).</summary>
    public int RecordEvery { get; init; } = 1;
    public bool RecordCurrents { get; init; }
    /// <summary>
    /// Keep every recorded sample's gate states (<see cref="Trace.GateStates"/>), so channel currents can be computed
    /// afterwards for just the samples wanted (<see cref="Simulator.ChannelCurrentsAt"/>); far cheaper than
    /// <see cref="RecordCurrents"/> when only a window is shown.
    /// </summary>
    public bool RecordGateStates { get; init; }
    /// <summary>
    /// Keep a <see cref="ResumePoint"/> every <see cref="ResumePointEverySteps"/> steps (<see cref="Trace.ResumePoints"/>), so
    /// part of the run can be computed again in more detail (gate states around a spike) without running it all.
    /// </summary>
    public bool KeepResumePoints { get; init; }

    /// <summary>Integration steps between the resume points a run keeps (10 ms at the default 25 us step).</summary>
    public const int ResumePointEverySteps = 400;
    public SpikeDetection Spikes { get; init; } = SpikeDetection.Default;
    /// <summary>Spike-only runs end as soon as a spike after this time (ms) is confirmed (in a SIMD group: once every lane has one). Null runs to the
    /// end.</summary>
    public double? StopAtFirstSpikeAfterMs { get; init; }

    public static SimulationSettings Default { get; } = new();
    public static SimulationSettings SpikesOnly { get; } = new() { RecordEvery = 0 };
}
