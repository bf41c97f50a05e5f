using ExprModel.Core.Recordings;

namespace ExprModel.Core.Tests.Recordings;

/// <summary>Read-out definitions on analytic waveforms (<see cref="SyntheticSweeps"/>), noise, drift and awkward sweeps.</summary>
public sealed class RecordingFeaturesTests
{
    private const double Dt = 0.02; // 50 kHz

    [Fact]
    public void PassiveRcCharging_GivesRAndTauExactly()
    {
        // Textbook identity: V(t) = V0 + R I (1 - exp(-t / tau)); here R = 200 MOhm, tau = 20 ms.
        var r = RecordingFeatures.Measure(SyntheticSweeps.Family(Dt)).Readouts;
        Assert.Equal(-65, r.RestingPotentialMv!.Value, 9);
        // Steady state over the step's last 20 ms of a 500 ms step: exp(-480 / 20) = 4e-11 of the deflection is still missing.
        Assert.Equal(200, r.InputResistanceMOhm!.Value, 6);
        // The line fit of ln(1 - dV/dV_end) over the 10-90 % part of an exact exponential returns its tau.
        Assert.Equal(20, r.MembraneTimeConstantMs!.Value, 6);
        Assert.Equal(0, r.SagRatio!.Value, 6); // a passive response has no sag
    }

    [Fact]
    public void TriangularSpike_GivesItsThresholdHalfWidthAndLatency()
    {
        var result = RecordingFeatures.Measure(SyntheticSweeps.Family(Dt));
        var r = result.Readouts;
        // Rheobase: the +40 pA step is the smallest that spikes; the +20 pA step below does not.
        Assert.Equal(40, r.RheobasePa!.Value, 9);
        Assert.Equal(20, result.RheobaseStepSpacingPa!.Value, 9);
        // Linear rise 200 mV/ms for 0.5 ms, fall 100 mV/ms for 1 ms: half amplitude (50 mV above threshold) is crossed
        // 0.25 ms after the foot going up and 1.0 ms after it coming down: half-width 0.75 ms.
        Assert.Equal(-65, r.ThresholdMv!.Value, 6);
        Assert.Equal(35, r.PeakMv!.Value, 6);
        Assert.Equal(100, r.AmplitudeMv!.Value, 6);
        Assert.Equal(0.75, r.HalfWidthMs!.Value, 6);
        Assert.Equal(200, r.MaxRiseMvPerMs!.Value, 6);
        Assert.Equal(0, r.AfterHyperpolarisationMv!.Value, 6);
        // The -20 mV detection level is crossed 45 / 200 = 0.225 ms into the rise, which starts 10 ms after onset.
        Assert.Equal(10.225, r.FirstSpikeLatencyMs!.Value, 6);
    }

    [Fact]
    public void RatesGainAndAdaptation_FollowFromSpikeCounts()
    {
        var result = RecordingFeatures.Measure(SyntheticSweeps.Family(Dt));
        // +80 pA: spikes every 50 ms from 105 to 555 ms over a 500 ms step = 10 spikes, 20 Hz; +40 pA: 1 spike, 2 Hz.
        Assert.Equal([0.0, 2, 20], result.FiCurve.Select(p => p.Rates.WholeStepRateHz));
        Assert.Equal([20.0, 40, 80], result.FiCurve.Select(p => p.CurrentPa).Select(a => Math.Round(a, 9)));
        // Gain: least-squares slope over 40 and 80 pA: 18 Hz / 40 pA = 0.45 Hz/pA = 450 Hz/nA.
        Assert.Equal(450, result.Readouts.FiGainHzPerNa!.Value, 6);
        // Adaptation on the first step at or above 2 x 40 pA: equal intervals give ratio 1 and index 0.
        Assert.Equal(80, result.AdaptationStepPa!.Value, 9);
        Assert.Equal(1, result.Readouts.AdaptationRatio!.Value, 9);
        Assert.Equal(0, result.Readouts.AdaptationIndex!.Value, 9);
    }

    [Fact]
    public void BaselineDriftBetweenSweeps_DoesNotEnterDeflections()
    {
        // Each sweep sits 2 mV higher than the one before (slow drift of the recording over the family).
        int k = 0;
        var drifted = SyntheticSweeps.Family(Dt, v => v.Select(x => x + 2 * k).ToArray().Also(() => k++));
        var r = RecordingFeatures.Measure(drifted);
        Assert.Equal(200, r.Readouts.InputResistanceMOhm!.Value, 6);
        Assert.Equal(20, r.Readouts.MembraneTimeConstantMs!.Value, 6);
        Assert.Contains(r.Readouts.Notes, n => n.Contains("drifts between sweeps"));
    }

    [Fact]
    public void NoisyRecording_IsSmoothedSoTheThresholdCriterionStillHolds()
    {
        // 0.5 mV rms noise at 50 kHz gives a raw slope noise of 0.5 sqrt(2) / 0.02 = 35 mV/ms, more than the 20 mV/ms
        // criterion itself: without smoothing the threshold walk stops on noise.
        var rng = new Random(7);
        var clean = RecordingFeatures.Measure(SyntheticSweeps.Family(Dt)).Readouts;
        var noisyCell = SyntheticSweeps.Family(Dt, v => SyntheticSweeps.WithNoise(v, 0.5, rng));
        var smoothed = RecordingFeatures.Measure(noisyCell);
        var raw = RecordingFeatures.Measure(noisyCell, new RecordingReadoutSettings { SlopeNoiseTargetMvPerMs = 1e9 });
        Assert.True(smoothed.SmoothingMs > 0);
        Assert.Equal(0, raw.SmoothingMs);
        Assert.Contains(smoothed.Readouts.Notes, n => n.Contains("moving average"));
        // Smoothing widens the triangle's foot by half the window (at most 0.5 ms x 200 mV/ms / 2 = 50 mV would be the
        // bound; the window here is ~0.2 ms): the threshold stays within 3 mV of the clean value; raw, it does not.
        double errSmoothed = Math.Abs(smoothed.Readouts.ThresholdMv!.Value - clean.ThresholdMv!.Value);
        double errRaw = Math.Abs(raw.Readouts.ThresholdMv!.Value - clean.ThresholdMv!.Value);
        Assert.True(errSmoothed < 3, $"smoothed threshold off by {errSmoothed:0.##} mV");
        Assert.True(errRaw > errSmoothed, $"raw {errRaw:0.##} mV, smoothed {errSmoothed:0.##} mV");
        // Passive read-outs average the noise out: the estimate of R over 2 x 20 ms windows of 0.5 mV noise is within 2 %.
        Assert.Equal(200, smoothed.Readouts.InputResistanceMOhm!.Value, 200 * 0.02);
        Assert.Equal(40, smoothed.Readouts.RheobasePa!.Value, 9);
    }

    [Fact]
    public void AbortedAndMissingSweeps_AreNamedAndLeftOut()
    {
        var family = SyntheticSweeps.Family(Dt);
        var sweeps = family.Sweeps.ToList();
        // Sweep 2 is lost; sweep 6 (+80 pA) stops 300 ms into its 500 ms step.
        var last = sweeps[5];
        int keep = (int)(400 / Dt);
        sweeps[5] = RecordedSweep.Create(6, Dt, last.VoltageMv[..keep], last.CurrentPa, "synthetic, sweep 6");
        sweeps.RemoveAt(1);
        var cell = family with { Sweeps = sweeps, Notes = [.. RecordedCell.GapNotes(sweeps)] };
        var r = RecordingFeatures.Measure(cell);
        Assert.Contains(r.Readouts.Notes, n => n.Contains("Sweep 2 is missing"));
        Assert.Contains(r.Readouts.Notes, n => n.Contains("sweep 6") && n.Contains("aborted"));
        Assert.Equal(4, r.SweepsUsed);
        // Without the +80 pA step, no step reaches 2 x rheobase: adaptation falls back to the largest and says so.
        Assert.Contains(r.Readouts.Notes, n => n.Contains("No step reaches"));
        Assert.Equal(200, r.Readouts.InputResistanceMOhm!.Value, 6);
    }

    [Fact]
    public void WhatCannotBeMeasured_IsNullWithAReason()
    {
        // Only depolarising steps that never spike: no passive read-outs, no rheobase, no spike shape.
        var sweeps = new[] { 20.0, 40 }.Select((a, k) => SyntheticSweeps.Sweep(k + 1, Dt, SyntheticSweeps.Passive(a, 200, 20, Dt),
            SyntheticSweeps.Command(a, Dt))).ToArray();
        var r = RecordingFeatures.Measure(new RecordedCell { CellId = "c", Source = "s", Sweeps = sweeps }).Readouts;
        Assert.Null(r.InputResistanceMOhm);
        Assert.Null(r.MembraneTimeConstantMs);
        Assert.Null(r.RheobasePa);
        Assert.Null(r.ThresholdMv);
        Assert.Null(r.AdaptationRatio);
        Assert.Contains(r.Notes, n => n.Contains("No hyperpolarising step"));
        Assert.Contains(r.Notes, n => n.Contains("No spike in any step up to 40 pA"));
    }

    [Theory]
    // The simulator's criterion (SpikeAtRheobase.IsRegenerative): the upstroke must reach the 20 mV/ms threshold
    // criterion (common practice) and three times the passive charging rate (here 40 pA / (20 ms / 200 MOhm = 100 pF) = 0.4 mV/ms).
    [InlineData(10, false)]
    [InlineData(19, false)]
    [InlineData(21, true)]
    [InlineData(200, true)]
    public void A_crossing_counts_as_the_rheobase_spike_only_when_regenerative(double riseMvPerMs, bool regenerative)
    {
        // The +40 pA step of the family carries a symmetric bump from rest to -15 mV: it crosses the -20 mV detection
        // level and falls back within the detector's 20 ms, so it is detected; only its rise rate decides.
        var cell = SyntheticSweeps.Family(Dt);
        var bump = Bump(riseMvPerMs, 50, Dt);
        var sweeps = cell.Sweeps.Select(w => w.SweepNumber == 5 ? SyntheticSweeps.Sweep(5, Dt, bump, SyntheticSweeps.Command(40, Dt)) : w).ToArray();
        var r = RecordingFeatures.Measure(cell with { Sweeps = sweeps }).Readouts;
        if (regenerative)
        {
            Assert.Equal(40, r.RheobasePa!.Value, 9);
            Assert.Equal(riseMvPerMs, r.MaxRiseMvPerMs!.Value, 6);
        }
        else
        {
            Assert.Null(r.RheobasePa);
            Assert.Null(r.ThresholdMv);
            Assert.Null(r.HalfWidthMs);
            Assert.Contains(r.Notes, n => n.Contains("no regenerative spike") && n.Contains("sweep 5"));
        }
    }

    /// <summary>Rest, then a linear rise of <paramref name="heightMv"/> at <paramref name="riseMvPerMs"/> 10 ms after onset, and the same fall.</summary>
    private static double[] Bump(double riseMvPerMs, double heightMv, double dtMs)
    {
        var v = SyntheticSweeps.Passive(0, 200, 20, dtMs);
        double start = SyntheticSweeps.OnsetMs + 10, rise = heightMv / riseMvPerMs;
        for (int k = 0; k < v.Length; k++)
        {
            double x = k * dtMs - start;
            if (x >= 0 && x <= rise) v[k] += riseMvPerMs * x;
            else if (x > rise && x <= 2 * rise) v[k] += heightMv - riseMvPerMs * (x - rise);
        }
        return v;
    }
}

internal static class TestExtensions
{
    public static T Also<T>(this T value, Action action)
    {
        action();
        return value;
    }
}
