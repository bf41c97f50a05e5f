using System.Runtime.Intrinsics;

namespace ExprModel.Core.Simulation;

/// <summary>
/// The SIMD sweep's ring of whole-pack snapshots (every <see cref="SweepKernel.CheckpointEverySteps"/> steps, the last
/// four kept), from which a lane's resume point before its first spike is taken (<see cref="ResumePoint"/>).
/// </summary>
internal sealed class SweepCheckpoints
{
    private const int Slots = 4;
    private readonly int _gates;
    private readonly int[] _step = new int[Slots];
    private readonly Vector256<double>[] _v = new Vector256<double>[Slots];
    private readonly Vector256<double>[] _vPrev = new Vector256<double>[Slots];
    private readonly Vector256<double>[] _ca = new Vector256<double>[Slots];
    private readonly Vector256<double>[] _na = new Vector256<double>[Slots];
    private readonly Vector256<double>[] _x;

    /// <summary>An empty ring for <paramref name="gates"/> gates, or the ring a shared baseline handed over (<paramref name="from"/>).</summary>
    public SweepCheckpoints(int gates, SweepStart? from)
    {
        _gates = gates;
        _x = new Vector256<double>[Slots * gates];
        Array.Fill(_step, -1);
        if (from is null) return;
        from.RingStep.CopyTo(_step, 0);
        from.RingVoltageMv.CopyTo(_v, 0);
        from.RingPreviousVoltageMv.CopyTo(_vPrev, 0);
        from.RingCalciumMm.CopyTo(_ca, 0);
        from.RingSodiumMm.CopyTo(_na, 0);
        from.RingGates.CopyTo(_x, 0);
    }

    /// <summary>Keeps the state at step <paramref name="step"/> (a multiple of <see cref="SweepKernel.CheckpointEverySteps"/>) in its slot.</summary>
    public void Take(int step, Vector256<double>[] gates, Vector256<double> v, Vector256<double> vPrev, Vector256<double> ca, Vector256<double> na)
    {
        int slot = step / SweepKernel.CheckpointEverySteps % Slots;
        _step[slot] = step;
        _v[slot] = v;
        _vPrev[slot] = vPrev;
        _ca[slot] = ca;
        _na[slot] = na;
        Array.Copy(gates, 0, _x, slot * _gates, _gates);
    }

    /// <summary>Lane <paramref name="lane"/> of the newest snapshot taken at or before step <paramref name="latest"/> (null when none is that early).</summary>
    public ResumePoint? Snapshot(int lane, int latest, double dt)
    {
        int best = -1;
        for (int k = 0; k < Slots; k++)
            if (_step[k] >= 0 && _step[k] <= latest && (best < 0 || _step[k] > _step[best])) best = k;
        if (best < 0) return null;
        var gs = new double[_gates];
        for (int g = 0; g < _gates; g++) gs[g] = _x[best * _gates + g][lane];
        return new ResumePoint(_step[best], _step[best] * dt, new CellState(_v[best][lane], gs, _ca[best][lane], _na[best][lane]), _vPrev[best][lane]);
    }

    /// <summary>The state a sweep after a shared baseline starts from: this state at <paramref name="step"/> with the ring as it stands.</summary>
    public SweepStart Start(int step, Vector256<double>[] gates, Vector256<double> v, Vector256<double> vPrev, Vector256<double> ca, Vector256<double> na) =>
        new()
        {
            Step = step,
            Gates = gates,
            VoltageMv = v,
            PreviousVoltageMv = vPrev,
            CalciumMm = ca,
            SodiumMm = na,
            RingStep = _step,
            RingVoltageMv = _v,
            RingPreviousVoltageMv = _vPrev,
            RingCalciumMm = _ca,
            RingSodiumMm = _na,
            RingGates = _x,
        };
}
