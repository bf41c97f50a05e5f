namespace ExprModel.Core.Analysis;

/// <summary>
/// The amplitude grid: evenly spaced by the absolute tolerance up to n0 = ceil(1/relative) points, then
/// geometric with ratio (1 + relative); neighbours are never further apart than max(absolute, relative x).
/// </summary>
public sealed class OnsetGrid
{
    private readonly double _step, _relative, _corner, _logRatio;
    private readonly long _cornerIndex;

    public OnsetGrid(double absoluteTolerance, double relativeTolerance)
    {
        if (!(absoluteTolerance > 0) || !(relativeTolerance > 0))
            throw new ArgumentOutOfRangeException(nameof(absoluteTolerance), "onset search tolerances must be positive");
        _step = absoluteTolerance;
        _relative = relativeTolerance;
        _cornerIndex = (long)Math.Ceiling(1 / relativeTolerance);
        _corner = _cornerIndex * absoluteTolerance;
        _logRatio = Math.Log(1 + relativeTolerance);
    }

    public double At(long n) => n <= _cornerIndex ? n * _step : _corner * Math.Exp((n - _cornerIndex) * _logRatio);

    /// <summary>The first grid index whose amplitude is at or above <paramref name="x"/>.</summary>
    public long Ceiling(double x)
    {
        if (x <= 0) return 0;
        long n = x <= _corner ? (long)Math.Ceiling(x / _step) : _cornerIndex + (long)Math.Ceiling(Math.Log(x / _corner) / _logRatio);
        // Guard the rounding of the logarithm: step to the exact first point at or above x.
        while (n > 0 && At(n - 1) >= x) n--;
        while (At(n) < x) n++;
        return n;
    }

    /// <summary>The last grid index whose amplitude is at or below <paramref name="x"/>.</summary>
    public long Floor(double x)
    {
        long n = Ceiling(x);
        return At(n) > x ? n - 1 : n;
    }
}
