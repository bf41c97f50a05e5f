using ExprModel.Core.Kinetics;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// The running state of <see cref="ChannelNoise"/>: V, calcium, shell sodium and, per channel type, either the number of
/// channels in each state (<see cref="ChannelPopulation"/>, binomial tracking) or the mean gates and mode fluctuations
/// (<see cref="ChannelDiffusion"/> in a <see cref="DiffusionBank"/>, from <see cref="ChannelNoiseSettings.DiffusionFromChannels"/>
/// channels). Subunit flip probabilities come from the deterministic kernel's rate table for the same step
/// (<see cref="RateTable"/>: decay e = exp(-dt/tau) and drive x_inf (1 - e) on a 0.01 mV grid, interpolated linearly), so a step costs
/// no exponential or rate evaluation per gate: opening = drive, closing = 1 - e - drive.
/// Concentration-gated gates take their steady state and decay per step as the deterministic loop does.
/// </summary>
internal sealed class ChannelNoiseState
{
    private readonly CompiledCell _cell;
    private readonly StepPlan _plan;
    private readonly StochasticRandom _rng;
    private readonly double _dt;
    private readonly double _exactUpTo;
    private readonly RateTable _table;
    private readonly double[] _calciumRateExponent;
    private readonly ChannelPopulation?[] _populations;
    /// <summary>Per channel on the diffusion path, its index in <see cref="_bank"/> (-1: not on that path).</summary>
    private readonly int[] _diffusionIndex;
    private readonly DiffusionBank? _bank;
    /// <summary>Per channel with a scheme: the cell gate index of each kinetic gate, and of each instantaneous gate.</summary>
    private readonly int[][] _kineticGates;
    private readonly int[][] _instantGates;
    /// <summary>Every cell gate whose probabilities a step needs (kinetic and instantaneous gates of every channel).</summary>
    private readonly int[] _usedGates;
    private readonly double[] _opening;
    private readonly double[] _closing;
    /// <summary>x_inf of instantaneous gates at the present V.</summary>
    private readonly double[] _steady;
    /// <summary>Conductance (mS/cm2) of one open channel of each type: gamma / (10 x area).</summary>
    private readonly double[] _perChannelMsPerCm2;
    private readonly double[] _g;
    private readonly double _shellDecay;
    private readonly double _sodiumDecay;

    public double VoltageMv { get; private set; }
    public double CalciumMm { get; private set; }
    public double SodiumMm { get; private set; }
    public IReadOnlyList<int> Counts { get; }
    public IReadOnlyList<ChannelNoiseMethod> Methods { get; }

    public ChannelNoiseState(CompiledCell cell, ChannelNoiseSettings settings)
    {
        _cell = cell;
        _plan = cell.Plan;
        _rng = new StochasticRandom(settings.Seed);
        _dt = settings.DtMs;
        _exactUpTo = settings.ExactUpToMean;
        _table = cell.Kinetics.TableFor(_dt);
        var k = cell.Kinetics;
        _calciumRateExponent = Enumerable.Range(0, cell.GateCount).Select(g => _plan.CalciumRateExponent(g, _dt)).ToArray();
        double area = cell.Model.Geometry.AreaUm2;
        int channels = cell.ChannelCount;
        _populations = new ChannelPopulation?[channels];
        _diffusionIndex = new int[channels];
        Array.Fill(_diffusionIndex, -1);
        var diffusions = new List<(ChannelDiffusion, int[], double[]?)>();
        var methods = new ChannelNoiseMethod[channels];
        _kineticGates = new int[channels][];
        _instantGates = new int[channels][];
        _perChannelMsPerCm2 = new double[channels];
        _g = new double[channels];
        _opening = new double[cell.GateCount];
        _closing = new double[cell.GateCount];
        _steady = new double[cell.GateCount];
        _shellDecay = cell.HasShell ? Math.Exp(-_dt / cell.ShellDecayMs) : 0;
        _sodiumDecay = cell.HasSodiumShell ? Math.Exp(-_dt / cell.SodiumShellDecayMs) : 0;
        var counts = new int[channels];
        VoltageMv = cell.Model.InitialVoltageMv;
        CalciumMm = cell.ShellRestMm;
        SodiumMm = cell.SodiumShellRestMm;
        var used = new SortedSet<int>();
        for (int c = 0; c < channels; c++)
        {
            int first = k.GateStart[c], end = k.GateEnd[c];
            var all = Enumerable.Range(first, end - first).ToArray();
            if (!all.Any(g => !k.GateIsInstantaneous[g]))
            {
                _kineticGates[c] = [];
                _instantGates[c] = all;
                used.UnionWith(all);
                continue;
            }
            var scheme = new MarkovScheme(k.GatePower[first..end], k.GateIsInstantaneous[first..end]);
            _kineticGates[c] = scheme.KineticGates.Select(i => first + i).ToArray();
            _instantGates[c] = scheme.InstantaneousGates.Select(i => first + i).ToArray();
            used.UnionWith(all);
            double gamma = settings.UnitaryConductancesPs[c];
            counts[c] = ChannelNoise.ChannelCount(cell.Gbar[c], area, gamma);
            _perChannelMsPerCm2[c] = gamma / (10 * area);
            var steady = _kineticGates[c].Select(g => cell.GateSteadyState(g, VoltageMv, CalciumMm, SodiumMm)).ToArray();
            methods[c] = settings.MethodFor(counts[c]);
            if (methods[c] == ChannelNoiseMethod.Diffusion)
            {
                bool byVoltage = _kineticGates[c].All(g => _plan.Update[g] == GateUpdate.Table);
                _diffusionIndex[c] = diffusions.Count;
                diffusions.Add((new ChannelDiffusion(scheme, counts[c], steady), _kineticGates[c],
                    byVoltage ? ChannelDiffusion.Tabulate(scheme, _table, _kineticGates[c]) : null));
            }
            else
                _populations[c] = new ChannelPopulation(scheme, Multinomial(counts[c], scheme.StationaryOccupancy(steady)));
        }
        _usedGates = [.. used];
        _bank = diffusions.Count > 0 ? new DiffusionBank(diffusions, _rng) : null;
        Counts = counts;
        Methods = methods;
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

    /// <summary>One step: channel transitions at the present V and concentrations, then V and the shells.</summary>
    public void Step(double stimulusUaPerCm2)
    {
        var cell = _cell;
        double v = VoltageMv, ca = CalciumMm;
        SubunitProbabilities(v, ca, SodiumMm);
        var power = cell.Kinetics.GatePower;
        _bank?.Step(v, _opening, _closing, _rng);
        for (int c = 0; c < _g.Length; c++)
        {
            double open;
            if (_populations[c] is { } population)
            {
                var kinetic = _kineticGates[c];
                for (int i = 0; i < kinetic.Length; i++) population.Move(i, _opening[kinetic[i]], _closing[kinetic[i]], _rng, _exactUpTo);
                open = population.OpenCount * _perChannelMsPerCm2[c];
            }
            else if (_diffusionIndex[c] >= 0)
            {
                open = _bank!.OpenFraction(_diffusionIndex[c]) * Counts[c] * _perChannelMsPerCm2[c];
            }
            else
            {
                open = cell.Gbar[c];
            }
            foreach (int g in _instantGates[c])
            {
                double x = _steady[g], f = x;
                for (int j = 1; j < power[g]; j++) f *= x;
                open *= f;
            }
            _g[c] = open;
        }
        Membrane(v, ca, stimulusUaPerCm2);
    }

    /// <summary>Per-step opening and closing probabilities of every subunit (and x_inf of instantaneous gates) at V and the shells.</summary>
    private void SubunitProbabilities(double v, double ca, double na)
    {
        var data = _table.Data;
        double pos = (v - RateTable.MinMv) * (1.0 / RateTable.ResolutionMv);
        pos = Math.Clamp(pos, 0, _table.Points - 2);
        int i = (int)pos;
        double f = pos - i;
        int j = 2 * i;
        foreach (int g in _usedGates)
        {
            double inf, decay;
            switch (_plan.Update[g])
            {
                case GateUpdate.Table:
                    {
                        var t = data[g]!;
                        decay = t[j] + f * (t[j + 2] - t[j]);
                        double drive = t[j + 1] + f * (t[j + 3] - t[j + 1]);
                        _opening[g] = drive;
                        _closing[g] = Math.Max(0, 1 - decay - drive);
                        continue;
                    }
                case GateUpdate.TableInstantaneous:
                    {
                        var t = data[g]!;
                        _steady[g] = t[j + 1] + f * (t[j + 3] - t[j + 1]);
                        continue;
                    }
                case GateUpdate.CalciumHill:
                    inf = _plan.HillSteadyState<ScalarLanes, double>(g, ca);
                    decay = _table.CalciumDecay[g];
                    break;
                case GateUpdate.SodiumHill:
                    inf = _plan.HillSteadyState<ScalarLanes, double>(g, na);
                    decay = _table.CalciumDecay[g];
                    break;
                default:
                    inf = _plan.CalciumRatesSteadyState(g, v, ca, out double rateSum);
                    decay = Math.Exp(rateSum * _calciumRateExponent[g]);
                    break;
            }
            _steady[g] = inf;
            _opening[g] = inf * (1 - decay);
            _closing[g] = (1 - inf) * (1 - decay);
        }
    }

    /// <summary>Membrane: exponential update with conductances frozen over the step (GHK calcium as a current at the present V).</summary>
    private void Membrane(double v, double ca, double stimulusUaPerCm2)
    {
        var cell = _cell;
        double gTotal = 0, gE = 0, other = 0, ica = 0, ina = 0;
        double eCa = double.NaN;
        for (int c = 0; c < _g.Length; c++)
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
            if (_plan.CarriesCalcium[c]) ica += i;
            if (_plan.CarriesSodium[c]) ina += i;
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
            CalciumMm = Math.Max(0, caInf + (ca - caInf) * _shellDecay);
        }
        if (cell.HasSodiumShell)
        {
            double naInf = cell.SodiumShellRestMm - cell.SodiumInflowPerCurrent * cell.SodiumShellDecayMs * ina;
            SodiumMm = Math.Max(0, naInf + (SodiumMm - naInf) * _sodiumDecay);
        }
    }
}
