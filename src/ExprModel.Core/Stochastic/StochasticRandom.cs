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

    /// <summary>Standard normal variate (ziggurat method, <see cref="NormalZiggurat"/>).</summary>
    public double NextNormal() => NormalZiggurat.Next(this);

    /// <summary>
    /// Fills <paramref name="into"/> with standard normal variates by the same ziggurat as <see cref="NextNormal"/> (same
    /// bits per draw, same distribution), with the generator's state held in locals over the batch: the common draw (a
    /// point inside the next strip's width) costs one 64-bit output and a comparison; the rest goes through
    /// <see cref="NormalZiggurat.Finish"/>.
    /// </summary>
    public void FillNormals(Span<double> into)
    {
        var x = NormalZiggurat.X;
        ulong s0 = _s0, s1 = _s1, s2 = _s2, s3 = _s3;
        for (int n = 0; n < into.Length; n++)
        {
            ulong bits = ulong.RotateLeft(s1 * 5, 7) * 9;
            ulong t = s1 << 17;
            s2 ^= s0;
            s3 ^= s1;
            s1 ^= s2;
            s0 ^= s3;
            s2 ^= t;
            s3 = ulong.RotateLeft(s3, 45);
            int strip = (int)(bits & (NormalZiggurat.Strips - 1));
            double z = (bits >> 11) * (1.0 / (1UL << 53)) * x[strip];
            if (z < x[strip + 1])
            {
                // Sign from bit 8 without a branch (bit 8 moved to the sign bit 63).
                into[n] = BitConverter.Int64BitsToDouble(BitConverter.DoubleToInt64Bits(z) ^ (long)((bits & 256) << 55));
                continue;
            }
            (_s0, _s1, _s2, _s3) = (s0, s1, s2, s3);
            into[n] = NormalZiggurat.Finish(this, strip, z, (bits & 256) != 0);
            (s0, s1, s2, s3) = (_s0, _s1, _s2, _s3);
        }
        (_s0, _s1, _s2, _s3) = (s0, s1, s2, s3);
    }

    /// <summary>
    /// A binomial count of <paramref name="n"/> trials with success probability <paramref name="p"/>, drawn on the
    /// rarer outcome (q = min(p, 1 - p)). Exact while the expected count nq is at most <paramref name="exactUpToMean"/>:
    /// below <see cref="RejectionFromMean"/> by inversion from one uniform (walk the cumulative distribution from 0 by the
    /// pmf recurrence, cost about the mean; a uniform below 1 - nq is a 0 at once, since P(0) = (1 - q)^n &gt;= 1 - nq by
    /// Bernoulli's inequality, the same answer the walk gives), from there by transformed rejection (Hormann 1993,
    /// <see cref="TransformedRejection"/>, cost independent of the mean). Above the limit the normal approximation
    /// N(nq, nq(1-q)), rounded and clamped to [0, n] (common practice for large counts). A single trial is one comparison.
    /// </summary>
    public int NextBinomial(int n, double p, double exactUpToMean = 25)
    {
        if (n <= 0 || !(p > 0)) return 0;
        if (p >= 1) return n;
        if (n == 1) return NextDouble() < p ? 1 : 0;
        bool flip = p > 0.5;
        double q = flip ? 1 - p : p;
        double mean = n * q;
        int k;
        if (!(mean <= exactUpToMean))
        {
            k = NormalCount(n, q, mean);
        }
        else if (mean >= RejectionFromMean)
        {
            k = TransformedRejection(n, q);
        }
        else
        {
            double u = NextDouble();
            k = u < 1 - mean ? 0 : Inversion(u, n, q, Math.Exp(n * Math.Log(1 - q)));
        }
        return flip ? n - k : k;
    }

    /// <summary>Expected count from which exact draws use <see cref="TransformedRejection"/> rather than inversion.</summary>
    public const double RejectionFromMean = 10;

    /// <summary>Inversion from the uniform <paramref name="u"/>, walking up from P(0) = <paramref name="pmf"/> = (1 - q)^n.</summary>
    internal static int Inversion(double u, int n, double q, double pmf)
    {
        double r = q / (1 - q);
        var reciprocal = Reciprocals;
        int k = 0;
        while (u > pmf && k < n)
        {
            u -= pmf;
            pmf *= r * (n - k) * (k < reciprocal.Length ? reciprocal[k] : 1.0 / (k + 1));
            k++;
            if (pmf <= 0) break;
        }
        return k;
    }

    /// <summary>
    /// Exact binomial draw for nq &gt;= 10, q &lt;= 1/2, by transformed rejection with squeeze (Hormann 1993, "The
    /// generation of binomial random variates", J Stat Comput Simul 46:101; the constants are the paper's, from memory,
    /// and the draws are checked against MathNet.Numerics' binomial pmf in the tests). A pair of uniforms (u, v) is mapped
    /// to k = floor((2a / us + b) u + c), us = 1/2 - |u|; inside the squeeze (us &gt;= 0.07, v &lt;= v_r, most pairs) k is
    /// taken at once; otherwise it is taken if ln(v alpha / (a / us^2 + b)) &lt;= ln(f(k) / f(m)), the pmf ratio to the
    /// mode m written with Stirling's series (exact tails from a table below 10).
    /// </summary>
    private int TransformedRejection(int n, double q)
    {
        double spq = Math.Sqrt(n * q * (1 - q));
        double b = 1.15 + 2.53 * spq;
        double a = -0.0873 + 0.0248 * b + 0.01 * q;
        double c = n * q + 0.5;
        double vr = 0.92 - 4.2 / b;
        double r = q / (1 - q);
        double alpha = (2.83 + 5.1 / b) * spq;
        double m = Math.Floor((n + 1) * q);
        while (true)
        {
            double u = NextDouble() - 0.5;
            double v = NextDouble();
            double us = 0.5 - Math.Abs(u);
            double k = Math.Floor((2 * a / us + b) * u + c);
            if (us >= 0.07 && v <= vr) return (int)k;
            if (k < 0 || k > n || us <= 0) continue;
            double lhs = Math.Log(v * alpha / (a / (us * us) + b));
            double rhs = (m + 0.5) * Math.Log((m + 1) / (r * (n - m + 1)))
                + (n + 1) * Math.Log((n - m + 1) / (n - k + 1))
                + (k + 0.5) * Math.Log(r * (n - k + 1) / (k + 1))
                + StirlingTail(m) + StirlingTail(n - m) - StirlingTail(k) - StirlingTail(n - k);
            if (lhs <= rhs) return (int)k;
        }
    }

    /// <summary>ln k! - [(k + 1/2) ln(k + 1) - (k + 1) + ln(2 pi)/2]: exact below 10, else Stirling's series in 1/(k + 1).</summary>
    private static double StirlingTail(double k)
    {
        if (k < 10) return StirlingTails[(int)k];
        double x = k + 1, x2 = x * x;
        return (1.0 / 12 - (1.0 / 360 - 1.0 / 1260 / x2) / x2) / x;
    }

    private static readonly double[] StirlingTails = [.. Enumerable.Range(0, 10).Select(k =>
        Enumerable.Range(1, k).Sum(j => Math.Log(j)) - ((k + 0.5) * Math.Log(k + 1) - (k + 1) + 0.5 * Math.Log(2 * Math.PI)))];

    private int NormalCount(int n, double q, double mean)
    {
        int k = (int)Math.Round(mean + Math.Sqrt(mean * (1 - q)) * NextNormal());
        return Math.Clamp(k, 0, n);
    }

    /// <summary>1 / (k + 1) for the inversion walk (a multiplication instead of a division per term).</summary>
    private static readonly double[] Reciprocals = [.. Enumerable.Range(1, 512).Select(k => 1.0 / k)];
}
