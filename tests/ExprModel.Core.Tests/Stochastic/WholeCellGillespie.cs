using ExprModel.Core.Simulation;
using ExprModel.Core.Stochastic;

namespace ExprModel.Core.Tests.Stochastic;

/// <summary>
/// The reference for the whole-cell accuracy check: continuous-time exact simulation of every channel's scheme
/// (Gillespie 1977, J Phys Chem 81:2340). The cell waits an exponential time with the total rate of all transitions of
/// all channels, then one transition happens, chosen with probability proportional to its rate. Between transitions the
/// conductances are constant, so V relaxes exactly (exponential); the rates are re-evaluated at the new V at least every
/// <c>maxHoldMs</c> (1 us by default, 25 times finer than the binomial method's step; the waiting time is memoryless, so
/// stopping a wait and drawing it again is exact). Ohmic channels without a calcium shell only (the squid-axon cell).
/// </summary>
internal static class WholeCellGillespie
{
    public sealed record Run(int Spikes, double MeanVoltageMv);

    public static Run Simulate(CompiledCell cell, IReadOnlyList<double> unitaryPs, double settleMs, double durationMs, long seed,
        double maxHoldMs = 0.001, double sampleMs = 0.025)
    {
        var k = cell.Kinetics;
        if (cell.HasShell || cell.Mode.Any(m => m != DriveMode.Ohmic)) throw new ArgumentException("ohmic channels without a shell only");
        var rng = new StochasticRandom(seed, 7);
        double area = cell.Model.Geometry.AreaUm2, v = cell.Model.InitialVoltageMv;
        int channels = cell.ChannelCount;
        var schemes = new MarkovScheme?[channels];
        var counts = new int[channels][];
        var perChannel = new double[channels];
        var alpha = new double[channels][];
        var beta = new double[channels][];
        double fixedG = 0, fixedGE = 0;
        for (int c = 0; c < channels; c++)
        {
            int first = k.GateStart[c], end = k.GateEnd[c];
            if (first == end)
            {
                fixedG += cell.Gbar[c];
                fixedGE += cell.Gbar[c] * cell.Erev[c];
                continue;
            }
            var scheme = new MarkovScheme(k.GatePower[first..end], k.GateIsInstantaneous[first..end]);
            if (scheme.InstantaneousGates.Count > 0) throw new ArgumentException("kinetic gates only");
            schemes[c] = scheme;
            counts[c] = new int[scheme.StateCount];
            alpha[c] = new double[end - first];
            beta[c] = new double[end - first];
            perChannel[c] = unitaryPs[c] / (10 * area);
            int n = ChannelNoise.ChannelCount(cell.Gbar[c], area, unitaryPs[c]);
            for (int ch = 0; ch < n; ch++)
            {
                // Each subunit open with its steady-state probability at the initial V (the stationary occupancy).
                int state = 0;
                for (int i = 0; i < end - first; i++)
                    for (int u = 0; u < scheme.Powers[i]; u++)
                        if (rng.NextDouble() < cell.GateSteadyState(first + i, v, cell.ShellRestMm)) state += scheme.Strides[i];
                counts[c][state]++;
            }
        }
        var detector = new SpikeDetector(SpikeDetection.Default);
        detector.Feed(0, v, sampleMs);
        double t = 0, nextSample = sampleMs, stopMs = settleMs + durationMs, vSum = 0;
        int spikes = 0, samples = 0;
        while (t < stopMs)
        {
            double total = 0, g = fixedG, gE = fixedGE;
            for (int c = 0; c < channels; c++)
            {
                if (schemes[c] is not { } scheme) continue;
                for (int i = 0; i < alpha[c].Length; i++)
                {
                    int gate = k.GateStart[c] + i;
                    double inf = cell.GateSteadyState(gate, v, cell.ShellRestMm), tau = cell.GateTimeConstantMs(gate, v);
                    alpha[c][i] = inf / tau;
                    beta[c][i] = (1 - inf) / tau;
                }
                for (int s = 0; s < scheme.StateCount; s++)
                    if (counts[c][s] > 0) total += counts[c][s] * scheme.ExitRate(s, alpha[c], beta[c]);
                double open = counts[c][scheme.OpenState] * perChannel[c];
                g += open;
                gE += open * cell.Erev[c];
            }
            double wait = total > 0 ? rng.NextExponential(total) : double.PositiveInfinity;
            double h = Math.Min(Math.Min(maxHoldMs, nextSample - t), stopMs - t);
            bool transition = wait <= h;
            if (transition) h = wait;
            double vInf = gE / g;
            v = vInf + (v - vInf) * Math.Exp(-h * g / cell.CapacitanceUfPerCm2);
            t += h;
            if (transition) Transition(rng.NextDouble() * total, schemes, counts, alpha, beta);
            if (t >= nextSample - 1e-12)
            {
                if (!double.IsNaN(detector.Feed(nextSample, v, sampleMs)) && nextSample > settleMs) spikes++;
                if (nextSample > settleMs)
                {
                    vSum += v;
                    samples++;
                }
                nextSample += sampleMs;
            }
        }
        return new Run(spikes, vSum / samples);
    }

    /// <summary>Carries out the transition that <paramref name="u"/> (uniform on [0, total rate)) falls on.</summary>
    private static void Transition(double u, MarkovScheme?[] schemes, int[][] counts, double[][] alpha, double[][] beta)
    {
        for (int c = 0; c < schemes.Length; c++)
        {
            if (schemes[c] is not { } scheme) continue;
            for (int s = 0; s < scheme.StateCount; s++)
            {
                int n = counts[c][s];
                if (n == 0) continue;
                for (int i = 0; i < scheme.Powers.Count; i++)
                {
                    int open = scheme.OpenSubunits(s, i);
                    double up = n * (scheme.Powers[i] - open) * alpha[c][i], down = n * open * beta[c][i];
                    if ((u -= up) < 0)
                    {
                        counts[c][s]--;
                        counts[c][s + scheme.Strides[i]]++;
                        return;
                    }
                    if ((u -= down) < 0)
                    {
                        counts[c][s]--;
                        counts[c][s - scheme.Strides[i]]++;
                        return;
                    }
                }
            }
        }
    }
}
