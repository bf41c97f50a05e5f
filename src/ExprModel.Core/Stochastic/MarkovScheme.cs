using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// The Markov scheme of a channel with independent gates, generated from the gate powers, never written per entry.
/// A gate with power p is p identical subunits; the channel's state is the number of open subunits of each gate, so a
/// channel has prod_g (p_g + 1) states (five for n^4, eight for m^3 h). From a state with k open subunits of gate g the
/// channel moves to k + 1 at rate (p_g - k) alpha_g and to k - 1 at rate k beta_g; it conducts only with every subunit
/// open (the scheme of Hodgkin &amp; Huxley's gates read as independent particles; DOMAIN.md "Stochastic channels").
/// Gates that follow their steady state at once (<see cref="GateSpec.Instantaneous"/>) have no states: they scale the
/// open channel's conductance by x_inf^p (their mean), which the guide names as a limit.
/// </summary>
public sealed class MarkovScheme
{
    /// <summary>Indices (into the entry's or cell's gate list) of the gates that have states.</summary>
    public IReadOnlyList<int> KineticGates { get; }
    /// <summary>Indices of the instantaneous gates (mean-field factor on the open conductance).</summary>
    public IReadOnlyList<int> InstantaneousGates { get; }
    /// <summary>Power of each kinetic gate, in <see cref="KineticGates"/> order.</summary>
    public IReadOnlyList<int> Powers { get; }
    /// <summary>Mixed-radix stride of each kinetic gate: state = sum_g k_g stride_g.</summary>
    public IReadOnlyList<int> Strides { get; }
    public int StateCount { get; }
    /// <summary>The one conducting state: every subunit open.</summary>
    public int OpenState { get; }

    private readonly int[] _powers;
    private readonly int[] _strides;

    /// <summary>A scheme for gates with these powers and instantaneous flags (in gate order).</summary>
    public MarkovScheme(IReadOnlyList<int> powers, IReadOnlyList<bool> instantaneous)
    {
        if (powers.Count != instantaneous.Count) throw new ArgumentException("one instantaneous flag per gate is needed", nameof(instantaneous));
        var kinetic = new List<int>();
        var instant = new List<int>();
        for (int g = 0; g < powers.Count; g++)
        {
            if (powers[g] < 1 || powers[g] > 8) throw new ArgumentOutOfRangeException(nameof(powers), $"gate {g}: power must be 1 to 8 (got {powers[g]})");
            (instantaneous[g] ? instant : kinetic).Add(g);
        }
        KineticGates = kinetic;
        InstantaneousGates = instant;
        _powers = kinetic.Select(g => powers[g]).ToArray();
        _strides = new int[_powers.Length];
        int stride = 1;
        for (int i = 0; i < _powers.Length; i++)
        {
            _strides[i] = stride;
            stride *= _powers[i] + 1;
        }
        Powers = _powers;
        Strides = _strides;
        StateCount = stride;
        int open = 0;
        for (int i = 0; i < _powers.Length; i++) open += _powers[i] * _strides[i];
        OpenState = open;
    }

    /// <summary>The scheme of a catalog entry's gates.</summary>
    public static MarkovScheme For(ChannelEntry entry) =>
        new(entry.Gates.Select(g => g.Power).ToArray(), entry.Gates.Select(g => g.Instantaneous).ToArray());

    /// <summary>Open subunits of kinetic gate <paramref name="i"/> in <paramref name="state"/>.</summary>
    public int OpenSubunits(int state, int i) => state / _strides[i] % (_powers[i] + 1);

    /// <summary>Label such as "m2 h1" (open subunits per gate).</summary>
    public string StateLabel(int state, IReadOnlyList<string> kineticGateNames) =>
        _powers.Length == 0 ? "open" : string.Join(' ', Enumerable.Range(0, _powers.Length).Select(i => $"{kineticGateNames[i]}{OpenSubunits(state, i)}"));

    /// <summary>Total rate (1/ms) of leaving <paramref name="state"/> for per-kinetic-gate rates alpha and beta.</summary>
    public double ExitRate(int state, ReadOnlySpan<double> alpha, ReadOnlySpan<double> beta)
    {
        double r = 0;
        for (int i = 0; i < _powers.Length; i++)
        {
            int k = OpenSubunits(state, i);
            r += (_powers[i] - k) * alpha[i] + k * beta[i];
        }
        return r;
    }

    /// <summary>
    /// Every transition out of each state for the given rates: targets and rates, in a fixed order (gate, up before
    /// down). <paramref name="targets"/>[s] and <paramref name="rates"/>[s] are filled with up to 2 x gates entries.
    /// </summary>
    public void Transitions(ReadOnlySpan<double> alpha, ReadOnlySpan<double> beta, int[][] targets, double[][] rates)
    {
        for (int s = 0; s < StateCount; s++)
        {
            int n = 0;
            for (int i = 0; i < _powers.Length; i++)
            {
                int k = OpenSubunits(s, i);
                targets[s][n] = s + _strides[i];
                rates[s][n++] = (_powers[i] - k) * alpha[i];
                targets[s][n] = s - _strides[i];
                rates[s][n++] = k * beta[i];
            }
        }
    }

    /// <summary>Allocates the jagged arrays <see cref="Transitions"/> fills.</summary>
    public (int[][] Targets, double[][] Rates) NewTransitionTables() =>
        (Enumerable.Range(0, StateCount).Select(_ => new int[2 * _powers.Length]).ToArray(),
         Enumerable.Range(0, StateCount).Select(_ => new double[2 * _powers.Length]).ToArray());

    /// <summary>
    /// Stationary occupancy for per-kinetic-gate steady states x_g: each gate's open-subunit count is binomial(p_g, x_g)
    /// and gates are independent (DOMAIN.md), so the occupancy is the product of binomial probabilities.
    /// </summary>
    public double[] StationaryOccupancy(ReadOnlySpan<double> steady)
    {
        var p = new double[StateCount];
        for (int s = 0; s < StateCount; s++)
        {
            double prob = 1;
            for (int i = 0; i < _powers.Length; i++)
            {
                int k = OpenSubunits(s, i);
                prob *= Choose(_powers[i], k) * Math.Pow(steady[i], k) * Math.Pow(1 - steady[i], _powers[i] - k);
            }
            p[s] = prob;
        }
        return p;
    }

    internal static double Choose(int n, int k)
    {
        double c = 1;
        for (int j = 1; j <= k; j++) c = c * (n - k + j) / j;
        return c;
    }
}
