namespace ExprModel.Core.Simulation;

/// <summary>
/// The slow, accurate reference: classic fourth-order Runge-Kutta on the full ODE with rates evaluated
/// directly (no tables), default step 1 us. Used by tests to check the fast integrator on spike counts and times.
/// </summary>
public static class ReferenceIntegrator
{
    public static Trace Run(CompiledCell cell, Stimulus stimulus, double durationMs, double dtMs = 0.001, int recordEvery = 25,
        CellState? initial = null, SpikeDetection? spikes = null, CancellationToken cancel = default)
    {
        int n = cell.StateLength;
        int steps = (int)Math.Round(durationMs / dtMs);
        var y = cell.Pack(initial ?? cell.InitialState());
        var k1 = new double[n]; var k2 = new double[n]; var k3 = new double[n]; var k4 = new double[n]; var tmp = new double[n];
        var detector = new SpikeDetector(spikes ?? SpikeDetection.Default);
        detector.Feed(0, y[0], dtMs);
        var spikeTimes = new List<double>();
        int samples = recordEvery > 0 ? steps / recordEvery + 1 : 0;
        var tRec = new double[samples]; var vRec = new double[samples]; var iRec = new double[samples];
        if (samples > 0) vRec[0] = y[0];
        for (int s = 0; s < steps; s++)
        {
            if ((s & 0xFFFF) == 0) cancel.ThrowIfCancellationRequested();
            double t = s * dtMs;
            double i0 = stimulus.DensityAt(t), ih = stimulus.DensityAt(t + dtMs / 2), i1 = stimulus.DensityAt(t + dtMs);
            cell.Derivatives(y, i0, k1);
            for (int j = 0; j < n; j++) tmp[j] = y[j] + 0.5 * dtMs * k1[j];
            cell.Derivatives(tmp, ih, k2);
            for (int j = 0; j < n; j++) tmp[j] = y[j] + 0.5 * dtMs * k2[j];
            cell.Derivatives(tmp, ih, k3);
            for (int j = 0; j < n; j++) tmp[j] = y[j] + dtMs * k3[j];
            cell.Derivatives(tmp, i1, k4);
            for (int j = 0; j < n; j++) y[j] += dtMs / 6 * (k1[j] + 2 * k2[j] + 2 * k3[j] + k4[j]);
            if (!(y[0] > -1000 && y[0] < 1000))
                throw new SimulationBlowUpException($"Reference integration left the physical range at t = {t + dtMs:F4} ms.", t + dtMs, "(reference)",
                    cell.Unpack(y));
            double sp = detector.Feed(t + dtMs, y[0], dtMs);
            if (!double.IsNaN(sp)) spikeTimes.Add(sp);
            if (recordEvery > 0 && (s + 1) % recordEvery == 0)
            {
                int r = (s + 1) / recordEvery;
                tRec[r] = t + dtMs; vRec[r] = y[0]; iRec[r] = i1;
            }
        }
        return new Trace
        {
            SampleIntervalMs = recordEvery * dtMs,
            TimeMs = tRec,
            VoltageMv = vRec,
            StimulusUaPerCm2 = iRec,
            SpikeTimesMs = spikeTimes,
            FinalState = cell.Unpack(y),
            DurationMs = steps * dtMs,
        };
    }
}
