using ExprModel.Core.Simulation;

namespace ExprModel.Web.Simulation;

/// <summary>
/// One step's trace shaped for the browser: a voltage trace thinned to <see cref="ModelRunner.PlotBuckets"/> buckets
/// (each keeps its lowest and highest sample, so spike peaks and troughs survive), the phase-plane points (dV/dt by
/// central differences of the recorded samples, thinned where the membrane is quiet), and each channel's current in a
/// window around the first spike.
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

    public const double WindowBeforeMs = 3, WindowAfterMs = 8;

    /// <param name="cell">The cell that ran; its channel currents are computed for the spike window from the recorded gate states.</param>
    /// <param name="spikeWindow">The stretch of the run around its first spike computed again with gate states (its samples
    /// are the trace's from the resume point's step on); without it, the trace itself must carry gate states.</param>
    public static StepView From(CompiledCell cell, Trace trace, StepProtocol step, Trace? spikeWindow = null)
    {
        var t = trace.TimeMs;
        var v = trace.VoltageMv;
        var (tt, vv) = Thin(t, v, ModelRunner.PlotBuckets);
        var (pv, ps) = Phase(t, v);
        double[] window = [];
        var currents = new Dictionary<string, double[]>();
        if (trace.SpikeTimesMs.Count > 0)
        {
            double s = trace.SpikeTimesMs[0];
            int from = Math.Max(0, Index(t, s - WindowBeforeMs)), to = Math.Min(t.Length - 1, Index(t, s + WindowAfterMs));
            // Every second sample (50 us) is plenty for the plot and halves what goes to the browser.
            var idx = Enumerable.Range(from, to - from + 1).Where(k => (k - from) % 2 == 0).ToArray();
            window = idx.Select(k => t[k] - s).ToArray();
            var labels = Simulator.ChannelLabels(cell);
            var source = spikeWindow ?? trace;
            int offset = spikeWindow is null ? 0 : (int)Math.Round(spikeWindow.TimeMs[0] / trace.SampleIntervalMs);
            var rows = idx.Select(k => Simulator.ChannelCurrentsAt(cell, source, k - offset)).ToArray();
            for (int c = 0; c < labels.Count; c++) currents[labels[c]] = rows.Select(r => r[c]).ToArray();
        }
        return new StepView
        {
            Protocol = step,
            TimeMs = tt,
            VoltageMv = vv,
            PhaseVoltageMv = pv,
            PhaseSlopeMvPerMs = ps,
            SpikeTimesMs = trace.SpikeTimesMs,
            SpikeWindowMs = window,
            SpikeWindowCurrents = currents,
            FullTimeMs = t,
            FullVoltageMv = v,
            FullStimulusUaPerCm2 = trace.StimulusUaPerCm2,
        };
    }

    private static int Index(double[] t, double time)
    {
        int i = Array.BinarySearch(t, time);
        return i >= 0 ? i : ~i;
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
