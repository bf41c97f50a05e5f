namespace ExprModel.Core.Simulation;

/// <summary>Streaming state of a <see cref="SpikeDetection"/> over one trace.</summary>
public struct SpikeDetector
{
    private readonly double _level;
    private readonly double _refractory;
    private readonly double _maxWidth;
    private double _pending;
    private bool _armed;
    private double _lastSpike;
    private double _lastV;
    private bool _started;

    public SpikeDetector(SpikeDetection settings)
    {
        _level = settings.LevelMv;
        _refractory = settings.RefractoryMs;
        _maxWidth = settings.MaxWidthMs;
        _pending = double.NaN;
        _armed = true;
        _lastSpike = double.NegativeInfinity;
        _lastV = double.NaN;
        _started = false;
    }

    /// <summary>Feeds the sample at time t; returns the interpolated crossing time of a spike confirmed now, or NaN.</summary>
    public double Feed(double tMs, double vMv, double dtMs)
    {
        double result = double.NaN;
        if (_started)
        {
            if (!double.IsNaN(_pending))
            {
                if (vMv < _level)
                {
                    result = _pending;
                    _pending = double.NaN;
                }
                else if (tMs - _pending > _maxWidth)
                {
                    _pending = double.NaN; // a plateau, not a spike
                }
            }
            if (!_armed && double.IsNaN(_pending) && vMv < _level && tMs - _lastSpike >= _refractory) _armed = true;
            if (_armed && _lastV < _level && vMv >= _level)
            {
                double frac = (_level - _lastV) / (vMv - _lastV);
                _pending = tMs - dtMs + frac * dtMs;
                _lastSpike = _pending;
                _armed = false;
            }
        }
        else
        {
            _started = true;
            _armed = vMv < _level;
        }
        _lastV = vMv;
        return result;
    }

    /// <summary>All spike times (ms) in a uniformly sampled trace.</summary>
    public static List<double> Detect(ReadOnlySpan<double> voltageMv, double dtMs, double startMs = 0, SpikeDetection? settings = null)
    {
        var d = new SpikeDetector(settings ?? SpikeDetection.Default);
        var spikes = new List<double>();
        for (int i = 0; i < voltageMv.Length; i++)
        {
            double s = d.Feed(startMs + i * dtMs, voltageMv[i], dtMs);
            if (!double.IsNaN(s)) spikes.Add(s);
        }
        return spikes;
    }
}
