namespace ExprModel.Core.Stochastic;

/// <summary>
/// The channels of one type in a whole cell, counted per state of their <see cref="MarkovScheme"/>, and the exact
/// one-step move of one gate (see <see cref="Move"/>). No allocation after construction.
/// </summary>
internal sealed class ChannelPopulation
{
    private const int Width = 9;
    private readonly int[] _powers;
    private readonly int[] _strides;
    /// <summary>Per kinetic gate, the open-subunit count of that gate in each state.</summary>
    private readonly int[][] _openSubunits;
    private int[] _counts;
    private int[] _next;
    private readonly double[] _keepOpen = new double[Width];
    private readonly double[] _keepClosed = new double[Width];
    /// <summary>Outcome weights of a flipping channel with k open (row k, outcome k'), made once per move when first needed.</summary>
    private readonly double[] _rows = new double[Width * Width];
    private readonly double[] _rowTotal = new double[Width];
    private readonly int[] _rowLikely = new int[Width];
    private readonly int[] _rowStamp = new int[Width];
    private readonly int[] _shared = new int[Width];
    private int _stamp;

    public MarkovScheme Scheme { get; }

    public ChannelPopulation(MarkovScheme scheme, int[] initialCounts)
    {
        Scheme = scheme;
        _powers = [.. scheme.Powers];
        _strides = [.. scheme.Strides];
        _openSubunits = new int[_powers.Length][];
        for (int i = 0; i < _powers.Length; i++)
        {
            _openSubunits[i] = new int[scheme.StateCount];
            for (int s = 0; s < scheme.StateCount; s++) _openSubunits[i][s] = scheme.OpenSubunits(s, i);
        }
        _counts = initialCounts;
        _next = new int[scheme.StateCount];
        _keepOpen[0] = _keepClosed[0] = 1;
    }

    public int OpenCount => _counts[Scheme.OpenState];

    public ReadOnlySpan<int> Counts => _counts;

    /// <summary>
    /// Moves every channel along kinetic gate <paramref name="i"/> for one step in which each closed subunit opens with
    /// probability <paramref name="opening"/> and each open one closes with probability <paramref name="closing"/>.
    /// A channel with k of p subunits open keeps every subunit as it is with probability S_k = (1 - closing)^k
    /// (1 - opening)^(p - k); the number of channels of a state in which something flips is one binomial draw,
    /// Bin(n, 1 - S_k). Those are then shared among the open-subunit counts k' by the binomial convolution of closings j
    /// of the k open and openings o of the p - k closed subunits (k' = k - j + o, every pair but j = o = 0), conditioned
    /// on a flip: one categorical draw per channel for a few channels, sequential binomials (most likely outcome last)
    /// for more. Exact for exact draws.
    /// The common case, nothing flips in a state, costs one uniform: P(0) = S_k^n &gt;= exp(-x) &gt;= 1 - x + x^2/2 - x^3/6
    /// with x = n (1 - S_k) / S_k (from -ln S &lt;= (1 - S) / S and the alternating Taylor series), so a uniform below
    /// that bound is the 0 the inversion would give; otherwise the inversion starts from S_k^n = exp(n ln S_k), with
    /// ln S_k = k ln(1 - closing) + (p - k) ln(1 - opening) (two logarithms per gate and step, when first needed).
    /// </summary>
    public void Move(int i, double opening, double closing, StochasticRandom rng, double exactUpToMean)
    {
        int p = _powers[i], stride = _strides[i];
        var open = _openSubunits[i];
        var counts = _counts;
        var next = _next;
        counts.AsSpan().CopyTo(next);
        var keepOpen = _keepOpen;
        var keepClosed = _keepClosed;
        for (int j = 1; j <= p; j++)
        {
            keepOpen[j] = keepOpen[j - 1] * (1 - closing);
            keepClosed[j] = keepClosed[j - 1] * (1 - opening);
        }
        _stamp++;
        double lnKeepOpen = double.NaN, lnKeepClosed = double.NaN;
        for (int s = 0; s < counts.Length; s++)
        {
            int n = counts[s];
            if (n == 0) continue;
            int k = open[s];
            double stay = keepOpen[k] * keepClosed[p - k], q = 1 - stay, mean = n * q;
            int m;
            if (q <= 0.5 && mean < StochasticRandom.RejectionFromMean && mean <= exactUpToMean)
            {
                double u = rng.NextDouble(), x = mean / stay;
                if (u < 1 - x * (1 - x * (0.5 - x * (1.0 / 6)))) continue;
                if (double.IsNaN(lnKeepOpen))
                {
                    lnKeepOpen = Math.Log(1 - closing);
                    lnKeepClosed = Math.Log(1 - opening);
                }
                double lnStay = (k == 0 ? 0 : k * lnKeepOpen) + (k == p ? 0 : (p - k) * lnKeepClosed);
                m = StochasticRandom.Inversion(u, n, q, Math.Exp(n * lnStay));
            }
            else
            {
                m = rng.NextBinomial(n, q, exactUpToMean);
            }
            if (m == 0) continue;
            next[s] -= m;
            if (p == 1)
            {
                next[k == 0 ? s + stride : s - stride] += m;
                continue;
            }
            int baseState = s - k * stride;
            Share(m, k, p, opening, closing, rng, exactUpToMean);
            var shared = _shared;
            for (int t = 0; t <= p; t++) next[baseState + t * stride] += shared[t];
        }
        _counts = next;
        _next = counts;
    }

    /// <summary>Shares m flipping channels with k of p open among the outcomes k' (counts left in <see cref="_shared"/>[k']).</summary>
    private void Share(int m, int k, int p, double opening, double closing, StochasticRandom rng, double exactUpToMean)
    {
        if (_rowStamp[k] != _stamp) MakeRow(k, p, opening, closing);
        var w = _rows.AsSpan(k * Width, p + 1);
        var x = _shared;
        for (int t = 0; t <= p; t++) x[t] = 0;
        double total = _rowTotal[k];
        int likely = _rowLikely[k];
        if (m <= 8)
        {
            for (int c = 0; c < m; c++)
            {
                double u = rng.NextDouble() * total;
                int t = 0;
                while (t < p && (u -= w[t]) >= 0) t++;
                if (w[t] == 0) t = likely;
                x[t]++;
            }
            return;
        }
        double left = total;
        for (int t = 0; t <= p && m > 0; t++)
        {
            if (t == likely || w[t] == 0) continue;
            int d = rng.NextBinomial(m, left > w[t] ? w[t] / left : 1, exactUpToMean);
            x[t] = d;
            m -= d;
            left -= w[t];
        }
        x[likely] += m;
    }

    /// <summary>w[k - j + o] = C(k, j) closing^j (1 - closing)^(k - j) C(p - k, o) opening^o (1 - opening)^(p - k - o), (j, o) != (0, 0).</summary>
    private void MakeRow(int k, int p, double opening, double closing)
    {
        var w = _rows.AsSpan(k * Width, p + 1);
        w.Clear();
        double closeJ = 1;
        for (int j = 0; j <= k; j++)
        {
            double a = Binomials[k][j] * closeJ * _keepOpen[k - j];
            double openO = 1;
            for (int o = 0; o <= p - k; o++)
            {
                if (j > 0 || o > 0) w[k - j + o] += a * Binomials[p - k][o] * openO * _keepClosed[p - k - o];
                openO *= opening;
            }
            closeJ *= closing;
        }
        double total = 0;
        int likely = 0;
        for (int t = 0; t <= p; t++)
        {
            total += w[t];
            if (w[t] > w[likely]) likely = t;
        }
        _rowTotal[k] = total;
        _rowLikely[k] = likely;
        _rowStamp[k] = _stamp;
    }

    /// <summary>Pascal's triangle to row 8 (gate powers are 1 to 8).</summary>
    private static readonly double[][] Binomials =
        [.. Enumerable.Range(0, Width).Select(n => Enumerable.Range(0, n + 1).Select(k => MarkovScheme.Choose(n, k)).ToArray())];
}

