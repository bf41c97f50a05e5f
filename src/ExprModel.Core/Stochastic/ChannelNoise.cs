using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// Whole-cell simulation with channel noise by channel-number tracking with binomial updates. Each channel type has
/// N = density x area / unitary conductance channels (rounded), counted per state of its generated
/// <see cref="MarkovScheme"/>. Over one step, at the step's voltage, every subunit of a gate flips independently with
/// the exact two-state probabilities (open: x_inf (1 - e), close: (1 - x_inf)(1 - e), e = exp(-dt/tau)), so the
/// channels of a state move to each open-subunit count with binomial-convolution probabilities and their numbers are one
/// multinomial draw (sequential binomials). Gates act on separate coordinates, so their generators commute and updating
/// them one after another is exact: with exact binomial draws the step is an exact sample of the chain at
/// piecewise-constant voltage. For large counts a draw takes the normal approximation (the established large-N
/// shortcut; <see cref="ChannelNoiseSettings.ExactUpToMean"/>). V then takes the exponential update of the membrane
/// equation with the conductances of the open channels, as the deterministic loop does.
/// Gates without states (instantaneous) scale the open conductance by their mean x_inf^p; channels without gates are
/// deterministic.
/// </summary>
public static class ChannelNoise
{
    /// <summary>N = density x area / gamma: with density in mS/cm2, area in um2 and gamma in pS, N = 10 density area / gamma.</summary>
    public static int ChannelCount(double densityMsPerCm2, double areaUm2, double unitaryPs) =>
        unitaryPs > 0 ? (int)Math.Min(int.MaxValue / 2, Math.Round(10 * densityMsPerCm2 * areaUm2 / unitaryPs)) : 0;

    /// <summary>The unitary conductance of each of the cell's channels from a lookup (e.g. the catalog's table).</summary>
    public static double[] UnitaryConductances(CellModel model, Func<ChannelEntry, double> unitaryPs) =>
        model.Channels.Select(c => unitaryPs(c.Entry)).ToArray();

    public static NoisyTrace Run(CompiledCell cell, Stimulus stimulus, double durationMs, ChannelNoiseSettings settings, CancellationToken cancel = default)
    {
        if (settings.UnitaryConductancesPs.Count != cell.ChannelCount)
            throw new ArgumentException($"one unitary conductance per channel is needed ({cell.ChannelCount}, got {settings.UnitaryConductancesPs.Count})",
                nameof(settings));
        if (!(settings.DtMs > 0) || settings.DtMs > 1)
            throw new ArgumentOutOfRangeException(nameof(settings), $"dtMs must lie in (0, 1] (got {settings.DtMs})");
        if (!(durationMs > 0) || durationMs > 600_000)
            throw new ArgumentOutOfRangeException(nameof(durationMs), $"durationMs must lie in (0, 600000] (got {durationMs})");
        var state = new ChannelNoiseState(cell, settings);
        double dt = settings.DtMs;
        int steps = (int)Math.Round(durationMs / dt);
        int every = settings.RecordEvery;
        int kept = every > 0 ? steps / every + 1 : 0;
        var times = new double[kept];
        var volts = new double[kept];
        var spikes = new List<double>();
        var detector = new SpikeDetector(SpikeDetection.Default);
        var stim = stimulus.Sample(dt, steps);
        if (every > 0)
        {
            times[0] = 0;
            volts[0] = state.VoltageMv;
        }
        detector.Feed(0, state.VoltageMv, dt);
        for (int s = 0; s < steps; s++)
        {
            if ((s & 4095) == 0) cancel.ThrowIfCancellationRequested();
            state.Step(stim[s]);
            double t = (s + 1) * dt;
            if (!double.IsFinite(state.VoltageMv) || Math.Abs(state.VoltageMv) > 1000)
                throw new SimulationBlowUpException($"Simulation with channel noise left the physical range at t = {t:F3} ms (stimulus {stim[s]:G4} uA/cm2).",
                    t, "(channel noise)", new CellState(state.VoltageMv, new double[cell.GateCount], state.CalciumMm));
            double spike = detector.Feed(t, state.VoltageMv, dt);
            if (!double.IsNaN(spike)) spikes.Add(spike);
            if (every > 0 && (s + 1) % every == 0)
            {
                times[(s + 1) / every] = t;
                volts[(s + 1) / every] = state.VoltageMv;
            }
        }
        return new NoisyTrace(times, volts, spikes, state.Counts) { Methods = state.Methods };
    }
}
