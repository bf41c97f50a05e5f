using MathNet.Numerics;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// Standard normal variates by the ziggurat method (Marsaglia &amp; Tsang 2000, J Stat Softw 5(8)): the half-density
/// f(x) = exp(-x^2/2) is covered by 256 stacked strips of equal area v. Strip i &gt;= 1 is the rectangle [0, x_i] x
/// [f(x_i), f(x_(i+1))]; strip 0 is the base rectangle [0, r] x [0, f(r)] (r = x_1) together with the tail beyond r. A
/// draw picks a strip and a point uniformly in it and keeps the point if it lies under f: inside the next strip's width
/// it always does (no exponential needed, about 99 % of draws); at a strip's ragged edge f is evaluated; beyond r
/// the tail is drawn by Marsaglia's (1964) exponential method. The strip edges follow from r, and r is found at start-up
/// by bisection so that the last strip closes exactly at f = 1 (r about 3.654 for 256 strips).
/// </summary>
internal static class NormalZiggurat
{
    public const int Strips = 256;

    /// <summary>Strip widths: X[0] = v / f(r) (the base strip's width if the tail were a rectangle), X[1] = r, ..., X[256] = 0.</summary>
    public static readonly double[] X = new double[Strips + 1];
    /// <summary>f(X[i]) (F[0] unused; F[256] = 1).</summary>
    public static readonly double[] F = new double[Strips + 1];
    public static readonly double TailStart;

    static NormalZiggurat()
    {
        double lo = 2, hi = 5;
        for (int it = 0; it < 200 && hi - lo > 1e-15; it++)
        {
            double mid = 0.5 * (lo + hi);
            if (Closure(mid, null) > 0) hi = mid;
            else lo = mid;
        }
        TailStart = 0.5 * (lo + hi);
        Closure(TailStart, X);
        X[Strips] = 0;
        for (int i = 1; i <= Strips; i++) F[i] = Density(X[i]);
    }

    private static double Density(double x) => Math.Exp(-0.5 * x * x);

    /// <summary>
    /// Builds the strip edges from r; returns how far the top strip falls short of f = 1 (negative: r too small, the
    /// strips reach the top too early; positive: too large).
    /// </summary>
    private static double Closure(double r, double[]? x)
    {
        double v = r * Density(r) + Math.Sqrt(Math.PI / 2) * SpecialFunctions.Erfc(r / Math.Sqrt(2));
        double xi = r;
        if (x is not null)
        {
            x[0] = v / Density(r);
            x[1] = r;
        }
        for (int i = 1; i < Strips - 1; i++)
        {
            double y = Density(xi) + v / xi;
            if (y >= 1) return -1;
            xi = Math.Sqrt(-2 * Math.Log(y));
            if (x is not null) x[i + 1] = xi;
        }
        return 1 - (Density(xi) + v / xi);
    }

    /// <summary>One standard normal variate from <paramref name="rng"/>.</summary>
    public static double Next(StochasticRandom rng)
    {
        var x = X;
        var f = F;
        while (true)
        {
            ulong bits = rng.NextBits();
            int strip = (int)(bits & (Strips - 1));
            double sign = (bits & 256) != 0 ? -1 : 1;
            double u = (bits >> 11) * (1.0 / (1UL << 53));
            double z = u * x[strip];
            if (z < x[strip + 1]) return sign * z;
            if (strip == 0) return sign * Tail(rng);
            double y = f[strip] + rng.NextDouble() * (f[strip + 1] - f[strip]);
            if (y < Density(z)) return sign * z;
        }
    }

    /// <summary>
    /// The rest of a draw whose point fell outside the next strip's width (see <see cref="Next"/>): the tail for strip 0,
    /// the edge test otherwise, and on rejection a fresh draw; used by <see cref="StochasticRandom.FillNormals"/>.
    /// </summary>
    internal static double Finish(StochasticRandom rng, int strip, double z, bool negative)
    {
        double sign = negative ? -1 : 1;
        if (strip == 0) return sign * Tail(rng);
        double y = F[strip] + rng.NextDouble() * (F[strip + 1] - F[strip]);
        return y < Density(z) ? sign * z : Next(rng);
    }

    private static double Tail(StochasticRandom rng)
    {
        double r = TailStart;
        while (true)
        {
            double a = -Math.Log(rng.NextOpenDouble()) / r;
            double b = -Math.Log(rng.NextOpenDouble());
            if (2 * b >= a * a) return r + a;
        }
    }
}
