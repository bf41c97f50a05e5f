using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// Per-subunit opening and closing rates of an entry's gates at one voltage and calcium: alpha = x_inf / tau and
/// beta = (1 - x_inf) / tau (the inverse of x_inf = alpha / (alpha + beta), tau = 1 / (alpha + beta), Hodgkin &amp;
/// Huxley 1952), with tau scaled for temperature by Q10 (common practice). Alpha/beta gates give back their own
/// alpha and beta this way; steady-state/tau gates and calcium gates (at the given calcium) get the rates with the same
/// relaxation.
/// </summary>
public sealed class GateRates
{
    private readonly ChannelEntry _entry;
    private readonly MarkovScheme _scheme;
    private readonly double _temperatureFactor;
    private readonly double _shiftMv;

    public GateRates(ChannelEntry entry, MarkovScheme scheme, double temperatureC, double shiftMv = 0)
    {
        _entry = entry;
        _scheme = scheme;
        _temperatureFactor = entry.TemperatureFactor(temperatureC);
        _shiftMv = shiftMv;
    }

    /// <summary>Fills alpha and beta (1/ms) of each kinetic gate at V (mV) and calcium (mM).</summary>
    public void At(double vMv, double calciumMm, Span<double> alpha, Span<double> beta)
    {
        for (int i = 0; i < _scheme.KineticGates.Count; i++)
        {
            var g = _entry.Gates[_scheme.KineticGates[i]];
            double inf = g.SteadyStateAt(vMv - _shiftMv, calciumMm);
            double tau = g.TimeConstantAt(vMv - _shiftMv, calciumMm) / _temperatureFactor;
            alpha[i] = inf / tau;
            beta[i] = (1 - inf) / tau;
        }
    }

    /// <summary>Steady state of each kinetic gate at V and calcium.</summary>
    public void SteadyAt(double vMv, double calciumMm, Span<double> steady)
    {
        for (int i = 0; i < _scheme.KineticGates.Count; i++)
            steady[i] = _entry.Gates[_scheme.KineticGates[i]].SteadyStateAt(vMv - _shiftMv, calciumMm);
    }

    /// <summary>Product of x_inf^p over the instantaneous gates: the mean-field factor on the open conductance.</summary>
    public double InstantaneousFactor(double vMv, double calciumMm)
    {
        double f = 1;
        foreach (int g in _scheme.InstantaneousGates)
            f *= Math.Pow(_entry.Gates[g].SteadyStateAt(vMv - _shiftMv, calciumMm), _entry.Gates[g].Power);
        return f;
    }
}
