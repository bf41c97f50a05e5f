namespace ExprModel.Core.Stochastic;

/// <summary>
/// The random source of the stochastic simulations: xoshiro256** (Blackman &amp; Vigna 2018, "Scrambled linear
/// pseudorandom number generators"), seeded through splitmix64 so that one 64-bit seed plus a stream number gives a
/// reproducible, independent-looking stream per sweep or per run regardless of thread scheduling.
/// </summary>
public sealed class StochasticRandom
{
    private ulong _s0, _s1, _s2, _s3;

    public StochasticRandom(long seed, long stream = 0)
    {
        ulong x = unchecked((ulong)seed * 0x9E3779B97F4A7C15UL ^ (ulong)stream * 0xD1B54A32D192ED03UL);
        _s0 = SplitMix(ref x);
        _s1 = SplitMix(ref x);
        _s2 = SplitMix(ref x);
        _s3 = SplitMix(ref x);
    }

    private static ulong SplitMix(ref ulong x)
    {
        ulong z = x += 0x9E3779B97F4A7C15UL;
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBUL;
        return z ^ (z >> 31);
    }

    public ulong NextBits()
    {
        ulong result = ulong.RotateLeft(_s1 * 5, 7) * 9;
        ulong t = _s1 << 17;
        _s2 ^= _s0;
        _s3 ^= _s1;
        _s1 ^= _s2;
        _s0 ^= _s3;
        _s2 ^= t;
        _s3 = ulong.RotateLeft(_s3, 45);
        return result;
    }

    /// <summary>Uniform on [0, 1) with 53 random bits.</summary>
    public double NextDouble() => (NextBits() >> 11) * (1.0 / (1UL << 53));

    /// <summary>Uniform on (0, 1]: safe to take the logarithm of.</summary>
    public double NextOpenDouble() => ((NextBits() >> 11) + 1) * (1.0 / (1UL << 53));

    /// <summary>Exponential waiting time with the given rate (1/ms): -ln(U)/rate.</summary>
    public double NextExponential(double rate) => -Math.Log(NextOpenDouble()) / rate;

    /// <summary>Standard normal by the polar method (Marsaglia &amp; Bray 1964); the second value is kept for the next call.</summary>
    public double NextNormal()
    {
        if (_hasSpare)
        {
            _hasSpare = false;
            return _spare;
        }
        double u, v, s;
        do
        {
            u = 2 * NextDouble() - 1;
            v = 2 * NextDouble() - 1;
            s = u * u + v * v;
        }
        while (s >= 1 || s == 0);
        double f = Math.Sqrt(-2 * Math.Log(s) / s);
        _spare = v * f;
        _hasSpare = true;
        return u * f;
    }

    private double _spare;
    private bool _hasSpare;

    /// <summary>
    /// A binomial count of <paramref name="n"/> trials with success probability <paramref name="p"/>. Exact (inversion
    /// by the pmf recurrence, on the smaller of p and 1 - p) while n min(p, 1-p) is at most
    /// <paramref name="exactUpToMean"/>; above that the normal approximation N(np, np(1-p)), rounded and clamped to
    /// [0, n] (common practice for large counts).
    /// </summary>
    public int NextBinomial(int n, double p, double exactUpToMean = 25)
    {
        if (n <= 0 || p <= 0) return 0;
        if (p >= 1) return n;
        bool flip = p > 0.5;
        double q = flip ? 1 - p : p;
        double mean = n * q;
        int k;
        if (mean <= exactUpToMean)
        {
            // Inversion: walk the cumulative distribution from 0 (cost about the mean).
            double r = q / (1 - q);
            double pmf = Math.Exp(n * Math.Log(1 - q));
            double u = NextDouble();
            k = 0;
            while (u > pmf && k < n)
            {
                u -= pmf;
                pmf *= r * (n - k) / (k + 1);
                k++;
                if (pmf <= 0) break;
            }
        }
        else
        {
            k = (int)Math.Round(mean + Math.Sqrt(mean * (1 - q)) * NextNormal());
            k = Math.Clamp(k, 0, n);
        }
        return flip ? n - k : k;
    }
}
