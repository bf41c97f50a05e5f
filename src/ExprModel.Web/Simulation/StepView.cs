using ExprModel.Core.Analysis;

namespace ExprModel.Web.Simulation;

/// <summary>
/// One step's trace shaped for the browser: a voltage trace thinned to <see cref="ModelRunner.PlotBuckets"/> buckets
/// (each keeps its lowest and highest sample, so spike peaks and troughs survive), the phase-plane points (dV/dt by
/// central differences of the recorded samples, thinned where the membrane is quiet), and each channel's current in a
/// window around the first spike (recorded by the library's <see cref="StepRecording"/>).
/// </summary>
public sealed record StepView
{
    public required StepProtocol Protocol { get; init; }
    public required double[] TimeMs { get; init; }
    public required double[] VoltageMv { get; init; }
    public required double[] PhaseVoltageMv { get; init; }
    public required double[] PhaseSlopeMvPerMs { get; init; }
    public required IReadOnlyList<double> SpikeTimesMs { get; init; }
    /// <summary>Time relative to the first spike (ms), empty when there is no spike.</summary>
    public required double[] SpikeWindowMs { get; init; }
    /// <summary>Per channel label, its current density (uA/cm2, outward positive) over <see cref="SpikeWindowMs"/>.</summary>
    public required IReadOnlyDictionary<string, double[]> SpikeWindowCurrents { get; init; }
    /// <summary>Full-resolution samples for CSV export (time, V, stimulus).</summary>
    public required double[] FullTimeMs { get; init; }
    public required double[] FullVoltageMv { get; init; }
    public required double[] FullStimulusUaPerCm2 { get; init; }

    /// <summary>Shapes a recorded step for the plots and the CSV export.</summary>
    public static StepView From(StepRecording recording, StepProtocol step)
    {
        var trace = recording.Trace;
        var t = trace.TimeMs;
        var v = trace.VoltageMv;
        var (tt, vv) = Thin(t, v, ModelRunner.PlotBuckets);
        var (pv, ps) = Phase(t, v);
        // Every second sample (50 us) of the spike window is plenty for the plot and halves what goes to the browser.
        var keep = Enumerable.Range(0, recording.SpikeWindowMs.Length).Where(k => k % 2 == 0).ToArray();
        var currents = new Dictionary<string, double[]>();
        if (keep.Length > 0)
            for (int c = 0; c < recording.ChannelLabels.Count; c++)
            {
                var series = recording.SpikeWindowCurrentsUaPerCm2[c];
                currents[recording.ChannelLabels[c]] = keep.Select(k => series[k]).ToArray();
            }
        return new StepView
        {
            Protocol = step,
            TimeMs = tt,
            VoltageMv = vv,
            PhaseVoltageMv = pv,
            PhaseSlopeMvPerMs = ps,
            SpikeTimesMs = trace.SpikeTimesMs,
            SpikeWindowMs = keep.Select(k => recording.SpikeWindowMs[k]).ToArray(),
            SpikeWindowCurrents = currents,
            FullTimeMs = t,
            FullVoltageMv = v,
            FullStimulusUaPerCm2 = trace.StimulusUaPerCm2,
        };
    }

    /// <summary>Shapes a run with channel noise (no channel currents are recorded for it).</summary>
    public static StepView FromNoisy(Core.Stochastic.NoisyTrace trace, StepProtocol step, Core.Simulation.Stimulus stimulus)
    {
        var t = trace.TimeMs;
        var v = trace.VoltageMv;
        var (tt, vv) = Thin(t, v, ModelRunner.PlotBuckets);
        var (pv, ps) = Phase(t, v);
        return new StepView
        {
            Protocol = step,
            TimeMs = tt,
            VoltageMv = vv,
            PhaseVoltageMv = pv,
            PhaseSlopeMvPerMs = ps,
            SpikeTimesMs = trace.SpikeTimesMs,
            SpikeWindowMs = [],
            SpikeWindowCurrents = new Dictionary<string, double[]>(),
            FullTimeMs = t,
            FullVoltageMv = v,
            FullStimulusUaPerCm2 = t.Select(stimulus.DensityAt).ToArray(),
        };
    }

    /// <summary>Keeps each bucket's first extreme then its other extreme, in time order.</summary>
    internal static (double[] T, double[] V) Thin(double[] t, double[] v, int buckets)
    {
        if (t.Length <= 2 * buckets) return (t, v);
        var tl = new List<double>(2 * buckets + 1);
        var vl = new List<double>(2 * buckets + 1);
        double per = (double)t.Length / buckets;
        for (int b = 0; b < buckets; b++)
        {
            int lo = (int)(b * per), hi = Math.Min(t.Length, (int)((b + 1) * per));
            if (hi <= lo) continue;
            int iMin = lo, iMax = lo;
            for (int i = lo; i < hi; i++)
            {
                if (v[i] < v[iMin]) iMin = i;
                if (v[i] > v[iMax]) iMax = i;
            }
            int first = Math.Min(iMin, iMax), second = Math.Max(iMin, iMax);
            tl.Add(t[first]); vl.Add(v[first]);
            if (second != first) { tl.Add(t[second]); vl.Add(v[second]); }
        }
        tl.Add(t[^1]); vl.Add(v[^1]);
        return (tl.ToArray(), vl.ToArray());
    }

    /// <summary>Side of the cells (as a fraction of each axis' range) that thin the phase plane; 1/300 is below a pixel on screen.</summary>
    internal const double PhaseCell = 1.0 / 300;

    /// <summary>
    /// dV/dt against V (central differences), thinned for the plot: a point is kept only when it enters a cell of a
    /// 300 x 300 grid over the plot's range that the curve has not visited yet. Repeated spikes retrace the same loop,
    /// so they add points only where they differ; where points are dropped the line is broken (NaN) so no false
    /// segment joins the pieces.
    /// </summary>
    internal static (double[] V, double[] Slope) Phase(double[] t, double[] v)
    {
        int n = v.Length - 2;
        if (n <= 0) return ([], []);
        var slope = new double[n];
        double vMin = double.PositiveInfinity, vMax = double.NegativeInfinity, sMin = double.PositiveInfinity, sMax = double.NegativeInfinity;
        for (int i = 1; i < v.Length - 1; i++)
        {
            double sl = (v[i + 1] - v[i - 1]) / (t[i + 1] - t[i - 1]);
            slope[i - 1] = sl;
            vMin = Math.Min(vMin, v[i]); vMax = Math.Max(vMax, v[i]);
            sMin = Math.Min(sMin, sl); sMax = Math.Max(sMax, sl);
        }
        double vScale = 1 / (Math.Max(vMax - vMin, 1e-9) * PhaseCell), sScale = 1 / (Math.Max(sMax - sMin, 1e-9) * PhaseCell);
        var seen = new HashSet<long>();
        var pv = new List<double>();
        var ps = new List<double>();
        bool broken = false;
        long lastCell = long.MinValue;
        for (int k = 0; k < n; k++)
        {
            double vk = v[k + 1], sk = slope[k];
            long cell = (long)((vk - vMin) * vScale) * 1_000_003L + (long)((sk - sMin) * sScale);
            if (cell == lastCell) continue;
            lastCell = cell;
            if (!seen.Add(cell))
            {
                broken = true;
                continue;
            }
            if (broken && pv.Count > 0)
            {
                pv.Add(double.NaN);
                ps.Add(double.NaN);
            }
            broken = false;
            pv.Add(vk);
            ps.Add(sk);
        }
        return (pv.ToArray(), ps.ToArray());
    }
}
