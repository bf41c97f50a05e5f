using System.Runtime.CompilerServices;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// The channels of one large type in a whole cell by diffusion approximation (Linaro, Storace &amp; Giugliano 2011, PLoS
/// Comput Biol 7:e1001102, "Accurate and fast simulation of channel noise in conductance-based model neurons by diffusion
/// approximation"): the open fraction is the deterministic Hodgkin-Huxley product prod_i x_i^p_i plus a sum of
/// independent Ornstein-Uhlenbeck processes, one per eigenmode of the channel's generated <see cref="MarkovScheme"/>.
/// <para>
/// The modes are derived here from the stationary autocovariance of the open fraction of N channels with independent
/// subunits (each subunit of gate i is a two-state chain with covariance x_i (1 - x_i) e^{-t/tau_i}):
/// C(t) = (1/N) [prod_i (x_i^2 + x_i (1 - x_i) e^{-t/tau_i})^p_i - prod_i x_i^(2 p_i)]. Expanding each power by the
/// binomial theorem gives one exponential per multi-index k (0 &lt;= k_i &lt;= p_i, not all 0) with rate sum_i k_i / tau_i and
/// weight (1/N) prod_i C(p_i, k_i) x_i^(2 p_i - k_i) (1 - x_i)^k_i. A Gaussian process with that covariance is the sum of
/// independent OU processes with those rates and variances; the weights add up to p (1 - p) / N, p = prod_i x_i^p_i, the
/// binomial variance of the open count over N^2 (common practice). There are prod_i (p_i + 1) - 1 modes (7 for m^3 h);
/// mode m is the scheme's state m + 1 read as the multi-index k.
/// </para>
/// <para>
/// Each step is the exact OU update at frozen parameters: z &lt;- E z + A xi / sqrt(N), E = prod_i e_i^k_i
/// (e_i = exp(-dt/tau_i) = 1 - opening - closing of a subunit), A = sqrt(w (1 - E^2)) with the weight w from the steady
/// states x_i = opening / (opening + closing) at the step's voltage and concentrations (the paper's voltage-dependent mode
/// parameters). For a type whose gates depend on V only, E and A are tabulated once per kinetics and step on a 0.1 mV grid
/// (from the rate table's own grid points) and interpolated linearly, as the rate table is; otherwise they are computed
/// per step. The mean gates x_i take the same exponential step as the deterministic loop. The open fraction is clipped to
/// [0, 1]. The mode fluctuations of all types of a cell live in one <see cref="DiffusionBank"/>; this class holds one
/// type's mean gates and derives its mode coefficients. No allocation after construction.
/// </para>
/// </summary>
internal sealed class ChannelDiffusion
{
    /// <summary>Grid spacing of the tabulated mode coefficients (every tenth point of <see cref="RateTable"/>).</summary>
    public const double GridMv = 0.1;
    public static readonly int TablePoints = (int)Math.Round((RateTable.MaxMv - RateTable.MinMv) / GridMv) + 1;
    private const int TableStep = 10;
    private const int Width = 9;

    private readonly int[] _powers;
    private readonly double[] _mean;
    /// <summary>Per mode and gate (mode-major), i x <see cref="Width"/> + k_i: where the mode's factors sit in the per-gate tables.</summary>
    private readonly int[] _offsets;
    /// <summary>Per gate i, e_i^j for j = 0..p_i (stride <see cref="Width"/>).</summary>
    private readonly double[] _decayPowers;
    /// <summary>Per gate i, sqrt(C(p_i, j) x_i^(2 p_i - j) (1 - x_i)^j) for j = 0..p_i (stride <see cref="Width"/>).</summary>
    private readonly double[] _spread;

    public int Channels { get; }
    public double InverseSqrtChannels { get; }
    public int ModeCount { get; }

    /// <summary>N channels of a scheme, mean gates starting at the per-kinetic-gate steady states <paramref name="steady"/>.</summary>
    public ChannelDiffusion(MarkovScheme scheme, int channels, ReadOnlySpan<double> steady)
    {
        if (channels < 1) throw new ArgumentOutOfRangeException(nameof(channels), $"at least one channel is needed (got {channels})");
        Channels = channels;
        InverseSqrtChannels = 1 / Math.Sqrt(channels);
        _powers = [.. scheme.Powers];
        int gates = _powers.Length;
        ModeCount = scheme.StateCount - 1;
        _offsets = new int[ModeCount * gates];
        for (int m = 0; m < ModeCount; m++)
        {
            for (int i = 0; i < gates; i++) _offsets[m * gates + i] = i * Width + scheme.OpenSubunits(m + 1, i);
        }
        _mean = steady.ToArray();
        _decayPowers = new double[gates * Width];
        _spread = new double[gates * Width];
    }

    /// <summary>Mean gate values (deterministic part), in kinetic-gate order.</summary>
    public ReadOnlySpan<double> Mean => _mean;

    /// <summary>prod_i x_i^p_i of the mean gates.</summary>
    public double MeanOpen
    {
        get
        {
            double f = 1;
            for (int i = 0; i < _powers.Length; i++)
            {
                double x = _mean[i];
                for (int j = 0; j < _powers[i]; j++) f *= x;
            }
            return f;
        }
    }

    /// <summary>Standard deviation (times sqrt N) of each mode at stationarity for the present mean gates: sqrt(w).</summary>
    public void StationarySpread(Span<double> into)
    {
        int gates = _powers.Length;
        for (int i = 0; i < gates; i++) Spread(i, _mean[i]);
        for (int m = 0; m < ModeCount; m++)
        {
            double w = 1;
            for (int i = 0; i < gates; i++) w *= _spread[_offsets[m * gates + i]];
            into[m] = w;
        }
    }

    /// <summary>The mean gates' exponential step: x &lt;- x (1 - opening - closing) + opening.</summary>
    public void AdvanceMeans(int[] gates, double[] opening, double[] closing)
    {
        for (int i = 0; i < _powers.Length; i++)
        {
            double o = opening[gates[i]];
            _mean[i] = _mean[i] * (1 - o - closing[gates[i]]) + o;
        }
    }

    /// <summary>
    /// E and A (without 1/sqrt(N)) of every mode for per-gate subunit probabilities (kinetic gate i reads
    /// <c>opening[gates[i]]</c>, <c>closing[gates[i]]</c>); a gate that cannot move takes its mean as steady state.
    /// </summary>
    public void Coefficients(int[] gates, double[] opening, double[] closing, Span<double> e, Span<double> a)
    {
        var powers = _powers;
        var decay = _decayPowers;
        for (int i = 0; i < powers.Length; i++)
        {
            double o = opening[gates[i]], leave = o + closing[gates[i]], d = 1 - leave;
            int b = i * Width;
            decay[b] = 1;
            for (int j = 1; j <= powers[i]; j++) decay[b + j] = decay[b + j - 1] * d;
            Spread(i, leave > 0 ? o / leave : _mean[i]);
        }
        int gatesCount = powers.Length;
        var offsets = _offsets;
        var spread = _spread;
        for (int m = 0; m < ModeCount; m++)
        {
            double em = 1, w = 1;
            int row = m * gatesCount;
            for (int i = 0; i < gatesCount; i++)
            {
                int at = offsets[row + i];
                em *= decay[at];
                w *= spread[at];
            }
            e[m] = em;
            a[m] = w * Math.Sqrt(Math.Max(0, 1 - em * em));
        }
    }

    /// <summary>sqrt(C(p, j) x^(2p - j) (1 - x)^j) = sqrt(C(p, j)) x^(p - j) (sqrt(x (1 - x)))^j for j = 0..p.</summary>
    private void Spread(int i, double x)
    {
        int p = _powers[i], b = i * Width;
        x = Math.Clamp(x, 0, 1);
        double root = Math.Sqrt(x * (1 - x));
        double up = 1;
        for (int j = 0; j <= p; j++)
        {
            _spread[b + j] = up * SqrtChoose[p * Width + j];
            up *= root;
        }
        double down = 1;
        for (int j = p; j >= 0; j--)
        {
            _spread[b + j] *= down;
            down *= x;
        }
    }

    private static readonly double[] SqrtChoose = [.. Enumerable.Range(0, Width * Width)
        .Select(n => n / Width >= n % Width ? Math.Sqrt(MarkovScheme.Choose(n / Width, n % Width)) : 0)];

    private static readonly ConditionalWeakTable<RateTable, System.Collections.Concurrent.ConcurrentDictionary<int, double[]>> Tables = new();

    /// <summary>
    /// The mode coefficients of a channel whose kinetic gates (cell gate indices <paramref name="gates"/>, every one read from
    /// the rate table by V alone) follow <paramref name="table"/>: per 0.1 mV grid point, E then A of every mode
    /// (2 x <see cref="ModeCount"/> values; A without 1/sqrt(N)). Made once per rate table and channel.
    /// </summary>
    public static double[] Tabulate(MarkovScheme scheme, RateTable table, int[] gates) =>
        Tables.GetValue(table, _ => new()).GetOrAdd(gates[0], _ => Build(scheme, table, gates));

    private static double[] Build(MarkovScheme scheme, RateTable table, int[] gates)
    {
        var probe = new ChannelDiffusion(scheme, 1, new double[gates.Length]);
        int n = probe.ModeCount;
        var result = new double[TablePoints * 2 * n];
        int cellGates = gates.Max() + 1;
        var opening = new double[cellGates];
        var closing = new double[cellGates];
        for (int p = 0; p < TablePoints; p++)
        {
            int j = 2 * Math.Min(p * TableStep, table.Points - 1);
            foreach (int g in gates)
            {
                var t = table.Data[g]!;
                opening[g] = t[j + 1];
                closing[g] = Math.Max(0, 1 - t[j] - t[j + 1]);
            }
            probe.Coefficients(gates, opening, closing, result.AsSpan(p * 2 * n, n), result.AsSpan(p * 2 * n + n, n));
        }
        return result;
    }
}
