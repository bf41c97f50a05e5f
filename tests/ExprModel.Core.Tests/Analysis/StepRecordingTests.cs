using ExprModel.Core.Analysis;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Tests.Analysis;

/// <summary>
/// The spike window is run again from a resume point with gate states; its channel currents must be the ones a run
/// recording every channel's current from the start gives (the same scalar loop from the same state).
/// </summary>
public class StepRecordingTests
{
    [Theory]
    [InlineData("wb1996", 1.0)]
    [InlineData("cortex-rs2008", 4.0)]
    [InlineData("hh1952", 10.0)]
    public void Window_currents_equal_currents_recorded_all_along(string preset, double amplitude)
    {
        var cell = TestCatalog.Preset(preset);
        var step = Protocols.Step(amplitude, 100, 500);
        var recording = StepRecording.Run(cell, step, 700);
        Assert.NotEmpty(recording.Trace.SpikeTimesMs);

        var whole = Simulator.Run(cell, step, 700, SimulationSettings.Default with { RecordCurrents = true });
        Assert.Equal(whole.SpikeTimesMs, recording.Trace.SpikeTimesMs);
        Assert.Equal(Simulator.ChannelLabels(cell), recording.ChannelLabels);
        for (int c = 0; c < recording.ChannelLabels.Count; c++)
        {
            var reference = whole.ChannelCurrentsUaPerCm2[recording.ChannelLabels[c]];
            var window = recording.SpikeWindowCurrentsUaPerCm2[c];
            Assert.Equal(recording.SpikeWindowSamples.Length, window.Length);
            for (int k = 0; k < window.Length; k++)
            {
                double expected = reference[recording.SpikeWindowSamples[k]];
                Assert.True(Math.Abs(window[k] - expected) <= 1e-9 * Math.Max(1, Math.Abs(expected)),
                    $"{recording.ChannelLabels[c]} at sample {recording.SpikeWindowSamples[k]}: {window[k]} against {expected}");
            }
        }
    }

    [Fact]
    public void Window_spans_the_stated_times_around_the_first_spike()
    {
        var recording = StepRecording.Run(TestCatalog.Preset("wb1996"), Protocols.Step(1.0, 100, 500), 700);
        double dt = recording.Trace.SampleIntervalMs;
        Assert.InRange(recording.SpikeWindowMs[0], -StepRecording.WindowBeforeMs, -StepRecording.WindowBeforeMs + dt);
        Assert.InRange(recording.SpikeWindowMs[^1], StepRecording.WindowAfterMs, StepRecording.WindowAfterMs + dt);
        double first = recording.Trace.SpikeTimesMs[0];
        for (int k = 0; k < recording.SpikeWindowMs.Length; k++)
            Assert.Equal(recording.Trace.TimeMs[recording.SpikeWindowSamples[k]] - first, recording.SpikeWindowMs[k], 12);
    }

    [Fact]
    public void Without_a_spike_the_window_is_empty()
    {
        var recording = StepRecording.Run(TestCatalog.Preset("wb1996"), Protocols.Step(0, 100, 500), 700);
        Assert.Empty(recording.Trace.SpikeTimesMs);
        Assert.Empty(recording.SpikeWindowMs);
        Assert.All(recording.SpikeWindowCurrentsUaPerCm2, Assert.Empty);
    }
}
