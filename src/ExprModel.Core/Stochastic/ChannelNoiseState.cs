using ExprModel.Core.Kinetics;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Stochastic;

/// <summary>The running state of <see cref="ChannelNoise"/>: V, calcium and, per channel type, the number of channels in each state.</summary>
internal sealed class ChannelNoiseState
{
    private readonly CompiledCell _cell;
    private readonly StochasticRandom _rng;
    private readonly double _dt;
    private readonly double _exactUpTo;
    private readonly MarkovScheme?[] _schemes;
    private readonly int[][] _counts;
    private readonly int[][] _next;
    /// <summary>Conductance (mS/cm2) of one open channel of each type: gamma / (10 x area).</summary>
    private readonly double[] _perChannelMsPerCm2;
    private readonly double[] _g;
    private readonly double[][] _transfer = new double[9][];

    public double VoltageMv { get; private set; }
    public double CalciumMm { get; private set; }
    public IReadOnlyList<int> Counts { get; }

    public ChannelNoiseState(CompiledCell cell, ChannelNoiseSettings settings)
    {
        _cell = cell;
        _rng = new StochasticRandom(settings.Seed);
        _dt = settings.DtMs;
        _exactUpTo = settings.ExactUpToMean;
        var k = cell.Kinetics;
        double area = cell.Model.Geometry.AreaUm2;
        _schemes = new MarkovScheme?[cell.ChannelCount];
        _counts = new int[cell.ChannelCount][];
        _next = new int[cell.ChannelCount][];
        _perChannelMsPerCm2 = new double[cell.ChannelCount];
        _g = new double[cell.ChannelCount];
        var counts = new int[cell.ChannelCount];
        VoltageMv = cell.Model.InitialVoltageMv;
        CalciumMm = cell.ShellRestMm;
        for (int c = 0; c < cell.ChannelCount; c++)
        {
            int first = k.GateStart[c], end = k.GateEnd[c];
            if (!Enumerable.Range(first, end - first).Any(g => !k.GateIsInstantaneous[g])) continue;
            var scheme = new MarkovScheme(k.GatePower[first..end], k.GateIsInstantaneous[first..end]);
            _schemes[c] = scheme;
            double gamma = settings.UnitaryConductancesPs[c];
            counts[c] = ChannelNoise.ChannelCount(cell.Gbar[c], area, gamma);
            _perChannelMsPerCm2[c] = gamma / (10 * area);
            var steady = scheme.KineticGates.Select(i => cell.GateSteadyState(first + i, VoltageMv, CalciumMm)).ToArray();
            _counts[c] = Multinomial(counts[c], scheme.StationaryOccupancy(steady));
            _next[c] = new int[scheme.StateCount];
        }
        Counts = counts;
        for (int p = 1; p <= 8; p++) _transfer[p] = new double[(p + 1) * (p + 1)];
    }

    private int[] Multinomial(int n, double[] probabilities)
    {
        var x = new int[probabilities.Length];
        double left = 1;
        for (int s = 0; s < probabilities.Length && n > 0; s++)
        {
            int draw = s == probabilities.Length - 1 ? n : _rng.NextBinomial(n, left > 0 ? Math.Min(1, probabilities[s] / left) : 1, _exactUpTo);
            x[s] = draw;
            n -= draw;
            left -= probabilities[s];
        }
        return x;
    }

    /// <summary>One step: channel transitions at the present V and calcium, then V and the calcium shell.</summary>
    public void Step(double stimulusUaPerCm2)
    {
        var cell = _cell;
        var k = cell.Kinetics;
        double v = VoltageMv, ca = CalciumMm;
        for (int c = 0; c < cell.ChannelCount; c++)
        {
            var scheme = _schemes[c];
            int first = k.GateStart[c];
            if (scheme is null)
            {
                double f = 1;
                for (int g = first; g < k.GateEnd[c]; g++) f *= Math.Pow(cell.GateSteadyState(g, v, ca), k.GatePower[g]);
                _g[c] = cell.Gbar[c] * f;
                continue;
            }
            for (int i = 0; i < scheme.KineticGates.Count; i++)
            {
                int g = first + scheme.KineticGates[i];
                double inf = cell.GateSteadyState(g, v, ca);
                double e = Math.Exp(-_dt / cell.GateTimeConstantMs(g, v, ca));
                MoveGate(scheme, i, inf * (1 - e), (1 - inf) * (1 - e), c);
            }
            double open = _counts[c][scheme.OpenState] * _perChannelMsPerCm2[c];
            foreach (int i in scheme.InstantaneousGates) open *= Math.Pow(cell.GateSteadyState(first + i, v, ca), k.GatePower[first + i]);
            _g[c] = open;
        }

        // Membrane: exponential update with conductances frozen over the step (GHK calcium as a current at the present V).
        double gTotal = 0, gE = 0, other = 0, ica = 0;
        double eCa = double.NaN;
        for (int c = 0; c < cell.ChannelCount; c++)
        {
            double g = _g[c];
            if (g == 0) continue;
            var mode = cell.Mode[c];
            double i;
            if (mode == DriveMode.Ohmic)
            {
                gTotal += g;
                gE += g * cell.Erev[c];
                i = g * (v - cell.Erev[c]);
            }
            else if (mode == DriveMode.NernstCalcium)
            {
                if (double.IsNaN(eCa)) eCa = Nernst.PotentialMv(cell.CalciumOutsideMm, Math.Max(ca, 1e-9), 2, cell.TemperatureC);
                gTotal += g;
                gE += g * eCa;
                i = g * (v - eCa);
            }
            else
            {
                i = g * cell.CalciumDrivingMv(mode, v, ca, 0);
                other += i;
            }
            if (cell.Plan.CarriesCalcium[c]) ica += i;
        }
        double cm = cell.CapacitanceUfPerCm2;
        if (gTotal > 0)
        {
            double vInf = (gE - other + stimulusUaPerCm2) / gTotal;
            VoltageMv = vInf + (v - vInf) * Math.Exp(-_dt * gTotal / cm);
        }
        else
        {
            VoltageMv = v + _dt * (stimulusUaPerCm2 - other) / cm;
        }
        if (cell.HasShell)
        {
            double caInf = cell.ShellRestMm - cell.ShellInflowPerCurrent * cell.ShellDecayMs * ica;
            CalciumMm = Math.Max(0, caInf + (ca - caInf) * Math.Exp(-_dt / cell.ShellDecayMs));
        }
    }

    /// <summary>
    /// Moves every channel of type c along gate i: a channel with k of p subunits open ends with k' open with probability
    /// T[k][k'] = sum_j C(k, j) (1 - pc)^j pc^(k - j) C(p - k, k' - j) po^(k' - j) (1 - po)^(p - k - k' + j), the
    /// binomial convolution of staying-open and newly opened subunits; the channels of each state are one multinomial draw.
    /// </summary>
    private void MoveGate(MarkovScheme scheme, int i, double po, double pc, int c)
    {
        int p = scheme.Powers[i], stride = scheme.Strides[i], width = p + 1;
        var t = _transfer[p];
        for (int from = 0; from <= p; from++)
        {
            for (int to = 0; to <= p; to++) t[from * width + to] = 0;
            for (int stay = 0; stay <= from; stay++)
            {
                double a = MarkovScheme.Choose(from, stay) * Math.Pow(1 - pc, stay) * Math.Pow(pc, from - stay);
                for (int opened = 0; opened <= p - from; opened++)
                    t[from * width + stay + opened] += a * MarkovScheme.Choose(p - from, opened) * Math.Pow(po, opened) * Math.Pow(1 - po, p - from - opened);
            }
        }
        var counts = _counts[c];
        var next = _next[c];
        Array.Clear(next);
        for (int s = 0; s < counts.Length; s++)
        {
            int n = counts[s];
            if (n == 0) continue;
            int kOpen = scheme.OpenSubunits(s, i);
            int baseState = s - kOpen * stride;
            double left = 1;
            int row = kOpen * width;
            // Draw the unlikely moves first and leave the rest in the most likely target (usually "no change").
            int likely = kOpen;
            for (int to = 0; to <= p && n > 0; to++)
            {
                if (to == likely) continue;
                double q = t[row + to];
                int x = q <= 0 ? 0 : _rng.NextBinomial(n, left > q ? q / left : 1, _exactUpTo);
                next[baseState + to * stride] += x;
                n -= x;
                left -= q;
            }
            next[baseState + likely * stride] += n;
        }
        _next[c] = counts;
        _counts[c] = next;
    }
}
