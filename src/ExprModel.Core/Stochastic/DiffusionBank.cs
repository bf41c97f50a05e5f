using System.Numerics;
using ExprModel.Core.Simulation;

namespace ExprModel.Core.Stochastic;

/// <summary>
/// The Ornstein-Uhlenbeck mode fluctuations of every channel type of a cell on the diffusion path
/// (<see cref="ChannelDiffusion"/>), in one array so that one step is one batch of normal variates and one vector loop.
/// Types whose gates depend on V alone come first: their coefficients (E, and A already divided by sqrt(N)) are copied
/// side by side from each type's table into one cell table per 0.1 mV grid point, and a step interpolates them and
/// updates z &lt;- E z + A xi for all those modes at once, <see cref="Vector{T}"/> lanes at a time. The other types'
/// (calcium- or sodium-gated) coefficients are computed per step.
/// </summary>
internal sealed class DiffusionBank
{
    private readonly ChannelDiffusion[] _types;
    private readonly int[][] _gates;
    private readonly int[] _start;
    private readonly bool[] _tabulated;
    /// <summary>Modes of the tabulated types (padded to the vector width); the other types' modes follow.</summary>
    private readonly int _tabulatedModes;
    private readonly double[] _z;
    private readonly double[] _normals;
    private readonly double[] _table;
    private readonly double[] _e;
    private readonly double[] _a;

    /// <summary>
    /// The bank of <paramref name="types"/>, each with its kinetic gates' cell indices and its table from
    /// <see cref="ChannelDiffusion.Tabulate"/> (null: computed per step); modes start from their stationary draw.
    /// </summary>
    public DiffusionBank(IReadOnlyList<(ChannelDiffusion Type, int[] Gates, double[]? Table)> types, StochasticRandom rng)
    {
        _types = types.Select(t => t.Type).ToArray();
        _gates = types.Select(t => t.Gates).ToArray();
        _tabulated = types.Select(t => t.Table is not null).ToArray();
        _start = new int[types.Count];
        int at = 0;
        for (int t = 0; t < types.Count; t++)
        {
            if (!_tabulated[t]) continue;
            _start[t] = at;
            at += _types[t].ModeCount;
        }
        int lanes = Vector<double>.Count;
        _tabulatedModes = (at + lanes - 1) / lanes * lanes;
        at = _tabulatedModes;
        int widest = 0;
        for (int t = 0; t < types.Count; t++)
        {
            widest = Math.Max(widest, _types[t].ModeCount);
            if (_tabulated[t]) continue;
            _start[t] = at;
            at += _types[t].ModeCount;
        }
        _z = new double[at];
        _normals = new double[at];
        _e = new double[widest];
        _a = new double[widest];
        int n = _tabulatedModes, points = ChannelDiffusion.TablePoints;
        _table = new double[_tabulatedModes > 0 ? points * 2 * n : 0];
        for (int t = 0; t < types.Count; t++)
        {
            var type = _types[t];
            int modes = type.ModeCount;
            type.StationarySpread(_e);
            for (int m = 0; m < modes; m++) _z[_start[t] + m] = _e[m] * type.InverseSqrtChannels * rng.NextNormal();
            if (types[t].Table is not { } own) continue;
            for (int p = 0; p < points; p++)
            {
                own.AsSpan(p * 2 * modes, modes).CopyTo(_table.AsSpan(p * 2 * n + _start[t], modes));
                var a = _table.AsSpan(p * 2 * n + n + _start[t], modes);
                own.AsSpan(p * 2 * modes + modes, modes).CopyTo(a);
                foreach (ref double x in a) x *= type.InverseSqrtChannels;
            }
        }
    }

    public int Count => _types.Length;

    /// <summary>
    /// One step at <paramref name="voltageMv"/> with the cell's per-gate subunit probabilities: the mean gates of every
    /// type, then every mode.
    /// </summary>
    public void Step(double voltageMv, double[] opening, double[] closing, StochasticRandom rng)
    {
        rng.FillNormals(_normals);
        var z = _z.AsSpan();
        var normals = _normals.AsSpan();
        int n = _tabulatedModes;
        if (n > 0)
        {
            double pos = Math.Clamp((voltageMv - RateTable.MinMv) * (1 / ChannelDiffusion.GridMv), 0, ChannelDiffusion.TablePoints - 2);
            int row = (int)pos;
            var vf = new Vector<double>(pos - row);
            var lo = _table.AsSpan(row * 2 * n, 2 * n);
            var hi = _table.AsSpan((row + 1) * 2 * n, 2 * n);
            for (int m = 0; m < n; m += Vector<double>.Count)
            {
                var e0 = new Vector<double>(lo[m..]);
                var a0 = new Vector<double>(lo[(n + m)..]);
                var e = e0 + vf * (new Vector<double>(hi[m..]) - e0);
                var a = a0 + vf * (new Vector<double>(hi[(n + m)..]) - a0);
                (e * new Vector<double>(z[m..]) + a * new Vector<double>(normals[m..])).CopyTo(z[m..]);
            }
        }
        for (int t = 0; t < _types.Length; t++)
        {
            var type = _types[t];
            if (!_tabulated[t])
            {
                type.Coefficients(_gates[t], opening, closing, _e, _a);
                double scale = type.InverseSqrtChannels;
                for (int m = 0, j = _start[t]; m < type.ModeCount; m++, j++) z[j] = _e[m] * z[j] + scale * _a[m] * normals[j];
            }
            type.AdvanceMeans(_gates[t], opening, closing);
        }
    }

    /// <summary>Open fraction of type <paramref name="t"/>: its mean product plus its modes, clipped to [0, 1].</summary>
    public double OpenFraction(int t)
    {
        var type = _types[t];
        double f = type.MeanOpen;
        foreach (double x in _z.AsSpan(_start[t], type.ModeCount)) f += x;
        return Math.Clamp(f, 0, 1);
    }

    /// <summary>The modes of type <paramref name="t"/> (mode m = state m + 1 of its scheme).</summary>
    public ReadOnlySpan<double> Modes(int t) => _z.AsSpan(_start[t], _types[t].ModeCount);

    /// <summary>Type <paramref name="t"/>.</summary>
    public ChannelDiffusion Type(int t) => _types[t];
}
