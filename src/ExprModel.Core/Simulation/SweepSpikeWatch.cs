using System.Runtime.Intrinsics;

namespace ExprModel.Core.Simulation;

/// <summary>
/// Spike detection for the lanes of a SIMD sweep, with the scalar detector's rule (<see cref="SpikeDetector"/>): a spike
/// is an upward crossing of the detection level, armed only a refractory period after the last crossing, counted when V
/// falls below the level again within the widest spike allowed. It also picks each lane's resume point: at the lane's
/// first crossing, the newest checkpoint at least the margin earlier, kept if that crossing is its first counted spike.
/// The kernel calls <see cref="Observe"/> only on steps where a lane is at or above the level or a crossing is pending.
/// </summary>
internal sealed class SweepSpikeWatch
{
    private readonly int _lanes;
    private readonly double _levelMv, _refractoryMs, _maxWidthMs, _dt;
    private readonly double? _stopAfterMs;
    private readonly double _resumeAfterMs;
    private readonly int _marginSteps;
    private readonly SweepCheckpoints? _checkpoints;
    private readonly List<double>[] _spikes;
    private readonly double[] _pending = new double[SweepKernel.Width];
    private readonly double[] _lastCross = new double[SweepKernel.Width];
    private readonly bool[] _done = new bool[SweepKernel.Width];
    private readonly bool[] _crossed = new bool[SweepKernel.Width];
    private readonly ResumePoint?[] _candidate = new ResumePoint?[SweepKernel.Width];
    private readonly double[] _firstCross = new double[SweepKernel.Width];
    private readonly ResumePoint?[] _resume;
    private int _lanesDone;

    /// <param name="checkpoints">The ring resume points are taken from; null when the sweep keeps none.</param>
    public SweepSpikeWatch(int lanes, SimulationSettings settings, int marginSteps, SweepCheckpoints? checkpoints)
    {
        _lanes = lanes;
        (_levelMv, _refractoryMs, _maxWidthMs, _dt) = (settings.Spikes.LevelMv, settings.Spikes.RefractoryMs, settings.Spikes.MaxWidthMs, settings.DtMs);
        _stopAfterMs = settings.StopAtFirstSpikeAfterMs;
        _resumeAfterMs = _stopAfterMs ?? 0;
        _marginSteps = marginSteps;
        _checkpoints = checkpoints;
        _spikes = new List<double>[lanes];
        for (int l = 0; l < lanes; l++) _spikes[l] = [];
        _resume = new ResumePoint?[lanes];
        Array.Fill(_pending, double.NaN);
        Array.Fill(_lastCross, double.NegativeInfinity);
    }

    /// <summary>True while some lane has a crossing waiting to be counted or dropped.</summary>
    public bool AnyPending { get; private set; }

    /// <summary>True when no lane ever crossed the level (the state after a baseline can then start a sweep).</summary>
    public bool NeverCrossed => !_crossed.Any(c => c) && _lastCross.All(double.IsNegativeInfinity) && _pending.All(double.IsNaN);

    /// <summary>
    /// Feeds V after step <paramref name="step"/> (and before it) to each lane's detector; true when every lane has
    /// counted a spike after <see cref="SimulationSettings.StopAtFirstSpikeAfterMs"/> (the sweep can stop).
    /// </summary>
    public bool Observe(int step, Vector256<double> v, Vector256<double> vPrev)
    {
        double t = (step + 1) * _dt;
        AnyPending = false;
        for (int l = 0; l < _lanes; l++)
        {
            double vl = v[l], vp = vPrev[l];
            if (!double.IsNaN(_pending[l]))
            {
                if (vl < _levelMv)
                {
                    if (_checkpoints is not null && _spikes[l].Count == 0 && _pending[l] == _firstCross[l] && _pending[l] >= _resumeAfterMs)
                        _resume[l] = _candidate[l];
                    _spikes[l].Add(_pending[l]);
                    if (_stopAfterMs is { } after && _pending[l] >= after && !_done[l]) { _done[l] = true; _lanesDone++; }
                    _pending[l] = double.NaN;
                }
                else if (t - _pending[l] > _maxWidthMs) _pending[l] = double.NaN;
            }
            // Armed at an upward crossing iff the previous sample was below the level at least one
            // refractory period after the last crossing (the scalar detector's rule, evaluated lazily).
            if (vp < _levelMv && vl >= _levelMv && double.IsNaN(_pending[l]) && (t - _dt) - _lastCross[l] >= _refractoryMs)
            {
                _pending[l] = t - _dt + (_levelMv - vp) / (vl - vp) * _dt;
                _lastCross[l] = _pending[l];
                if (_checkpoints is not null && !_crossed[l])
                {
                    _crossed[l] = true;
                    _firstCross[l] = _pending[l];
                    _candidate[l] = _checkpoints.Snapshot(l, (int)Math.Floor(_pending[l] / _dt) - _marginSteps, _dt);
                }
            }
            if (!double.IsNaN(_pending[l])) AnyPending = true;
        }
        return _lanesDone == _lanes;
    }

    /// <summary>Each lane's spike times and resume point.</summary>
    public SweepLane[] Lanes()
    {
        var result = new SweepLane[_lanes];
        for (int l = 0; l < _lanes; l++) result[l] = new SweepLane(_spikes[l], _resume[l]);
        return result;
    }
}
