using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Simulation;

/// <summary>How a channel's current is computed in the hot loop.</summary>
internal enum DriveMode : byte
{
    /// <summary>g (V - E) with a constant E.</summary>
    Ohmic,
    /// <summary>g (V - E_Ca) with E_Ca from the Nernst equation and the shell's current calcium.</summary>
    NernstCalcium,
    /// <summary>g * GHK(V, ca_in, ca_out).</summary>
    GhkCalcium,
}

/// <summary>The full state of a cell at one instant: membrane potential, every gate, shell calcium.</summary>
public sealed record CellState(double VoltageMv, double[] Gates, double CalciumMm);

/// <summary>
/// A <see cref="CellModel"/> flattened into arrays for the integrators: densities, reversal potentials,
/// gate powers and temperature factors. Built once per model and shared by every lane of a sweep.
/// </summary>
public sealed class CompiledCell
{
    public CellModel Model { get; }
    public int ChannelCount { get; }
    public int GateCount { get; }
    internal readonly double[] Gbar;
    internal readonly double[] Erev;
    internal readonly DriveMode[] Mode;
    internal readonly int[] GateStart;
    internal readonly int[] GateEnd;
    internal readonly int[] GatePower;
    internal readonly int[] GateChannel;
    internal readonly GateSpec[] Gates;
    internal readonly double[] GateShiftMv;
    internal readonly double[] GateTemperatureFactor;
    internal readonly bool[] GateIsCalcium;
    internal readonly bool[] GateIsInstantaneous;
    internal readonly double CapacitanceUfPerCm2;
    internal readonly bool HasShell;
    /// <summary>mM/ms of free calcium per uA/cm2 of inward calcium current: 10 / (2 F d[um] (1 + kappa)) (see <see cref="CalciumShell"/>).</summary>
    internal readonly double ShellInflowPerCurrent;
    internal readonly double ShellDecayMs;
    internal readonly double ShellRestMm;
    internal readonly double CalciumOutsideMm;
    internal readonly double TemperatureC;

    public CompiledCell(CellModel model)
    {
        if (model.Problem() is { } problem) throw new ModelException(problem);
        Model = model;
        ChannelCount = model.Channels.Count;
        Gbar = new double[ChannelCount];
        Erev = new double[ChannelCount];
        Mode = new DriveMode[ChannelCount];
        GateStart = new int[ChannelCount];
        GateEnd = new int[ChannelCount];
        var powers = new List<int>();
        var gateChannel = new List<int>();
        var gates = new List<GateSpec>();
        var shifts = new List<double>();
        var factors = new List<double>();
        TemperatureC = model.TemperatureC;
        for (int c = 0; c < ChannelCount; c++)
        {
            var ch = model.Channels[c];
            Gbar[c] = ch.EffectiveDensityMsPerCm2;
            Erev[c] = model.ReversalPotentialMv(ch);
            Mode[c] = ch.ReversalMv is null && ch.Entry.Ion == Ion.Calcium && model.CalciumShell is not null
                ? ch.Entry.Reversal == ReversalRule.GoldmanHodgkinKatz ? DriveMode.GhkCalcium : ch.Entry.Reversal == ReversalRule.Nernst ? DriveMode.NernstCalcium : DriveMode.Ohmic
                : ch.ReversalMv is null && ch.Entry.Reversal == ReversalRule.GoldmanHodgkinKatz ? DriveMode.GhkCalcium : DriveMode.Ohmic;
            GateStart[c] = gates.Count;
            double factor = ch.Entry.TemperatureFactor(model.TemperatureC) / ch.TauScale;
            foreach (var g in ch.Entry.Gates)
            {
                gates.Add(g);
                powers.Add(g.Power);
                gateChannel.Add(c);
                shifts.Add(ch.ShiftMv);
                factors.Add(factor);
            }
            GateEnd[c] = gates.Count;
        }
        GateCount = gates.Count;
        Gates = [.. gates];
        GatePower = [.. powers];
        GateChannel = [.. gateChannel];
        GateShiftMv = [.. shifts];
        GateTemperatureFactor = [.. factors];
        GateIsCalcium = Gates.Select(g => g.Kind == GateKind.Calcium).ToArray();
        GateIsInstantaneous = Gates.Select(g => g.Instantaneous).ToArray();
        CapacitanceUfPerCm2 = model.Geometry.CapacitanceUfPerCm2;
        CalciumOutsideMm = model.Ions.CalciumOutsideMm;
        if (model.CalciumShell is { } shell)
        {
            HasShell = true;
            ShellInflowPerCurrent = 10.0 / (2 * PhysicalConstants.Faraday * shell.DepthUm * (1 + shell.BufferCapacity));
            ShellDecayMs = shell.DecayMs;
            ShellRestMm = shell.RestMm;
        }
        else
        {
            ShellRestMm = model.Ions.CalciumInsideMm;
        }
    }

    /// <summary>Channel names in model order, as "entry-id" (used to label recorded currents).</summary>
    public IReadOnlyList<string> ChannelIds => Model.Channels.Select(c => c.Entry.Id).ToArray();

    /// <summary>Steady state of gate g at V (mV) and calcium (mM), with the channel's voltage shift.</summary>
    public double GateSteadyState(int g, double vMv, double calciumMm) => Gates[g].SteadyStateAt(vMv - GateShiftMv[g], calciumMm);

    /// <summary>Time constant (ms) of gate g at V, scaled for temperature by Q10.</summary>
    public double GateTimeConstantMs(int g, double vMv) => Gates[g].TimeConstantAt(vMv - GateShiftMv[g]) / GateTemperatureFactor[g];

    /// <summary>Time constant (ms) of gate g at V and intracellular calcium (BK-type gates depend on both).</summary>
    public double GateTimeConstantMs(int g, double vMv, double calciumMm) => Gates[g].TimeConstantAt(vMv - GateShiftMv[g], calciumMm) / GateTemperatureFactor[g];

    /// <summary>True for calcium gates written as voltage- and calcium-dependent rates (BK-type): tau varies every step.</summary>
    internal bool GateHasCalciumRates(int g) => Gates[g].Kind == GateKind.Calcium && Gates[g].Calcium is null;

    /// <summary>The state with V at <paramref name="vMv"/> and every gate at its steady state there.</summary>
    public CellState SteadyState(double vMv)
    {
        var x = new double[GateCount];
        for (int g = 0; g < GateCount; g++) x[g] = GateSteadyState(g, vMv, ShellRestMm);
        return new CellState(vMv, x, ShellRestMm);
    }

    public CellState InitialState() => SteadyState(Model.InitialVoltageMv);

    /// <summary>Conductance (mS/cm2) of channel c for the given gate values.</summary>
    internal double Conductance(int c, ReadOnlySpan<double> gates)
    {
        double g = Gbar[c];
        for (int k = GateStart[c]; k < GateEnd[c]; k++)
        {
            double x = gates[k];
            double p = x;
            for (int j = 1; j < GatePower[k]; j++) p *= x;
            g *= p;
        }
        return g;
    }

    /// <summary>Membrane current of channel c (uA/cm2, outward positive).</summary>
    internal double ChannelCurrent(int c, double vMv, ReadOnlySpan<double> gates, double calciumMm)
    {
        double g = Conductance(c, gates);
        if (Mode[c] == DriveMode.Ohmic) return g * (vMv - Erev[c]);
        double eCa = Mode[c] == DriveMode.NernstCalcium ? Nernst.PotentialMv(CalciumOutsideMm, Math.Max(calciumMm, 1e-9), 2, TemperatureC) : 0;
        return g * CalciumDrivingMv(Mode[c], vMv, calciumMm, eCa);
    }

    /// <summary>
    /// Driving term (mV) of a calcium channel: V - E_Ca (Nernst of shell calcium, passed in so a loop can compute it
    /// once per step) or the scaled GHK term. The one scalar definition, used here and by the scalar hot loop.
    /// </summary>
    internal double CalciumDrivingMv(DriveMode mode, double vMv, double calciumMm, double eCaMv) =>
        mode == DriveMode.NernstCalcium ? vMv - eCaMv : Nernst.GhkDrivingMv(vMv, Math.Max(calciumMm, 1e-9), CalciumOutsideMm, 2, TemperatureC);

    /// <summary>Total calcium current (uA/cm2) for the shell.</summary>
    internal double CalciumCurrent(double vMv, ReadOnlySpan<double> gates, double calciumMm)
    {
        double sum = 0;
        for (int c = 0; c < ChannelCount; c++)
            if (Model.Channels[c].Entry.Ion == Ion.Calcium) sum += ChannelCurrent(c, vMv, gates, calciumMm);
        return sum;
    }

    /// <summary>
    /// Right-hand side of the full ODE, y = [V, gates..., Ca], used by the reference integrators and the
    /// stability analysis. Instantaneous gates are held at their steady state (their derivative is zero).
    /// </summary>
    public void Derivatives(ReadOnlySpan<double> y, double stimulusUaPerCm2, Span<double> dy)
    {
        double v = y[0];
        double ca = HasShell ? y[GateCount + 1] : ShellRestMm;
        Span<double> x = GateCount <= 64 ? stackalloc double[GateCount] : new double[GateCount];
        for (int g = 0; g < GateCount; g++)
            x[g] = GateIsInstantaneous[g] ? GateSteadyState(g, v, ca) : y[g + 1];
        double total = 0;
        for (int c = 0; c < ChannelCount; c++) total += ChannelCurrent(c, v, x, ca);
        dy[0] = (stimulusUaPerCm2 - total) / CapacitanceUfPerCm2;
        for (int g = 0; g < GateCount; g++)
        {
            if (GateIsInstantaneous[g]) { dy[g + 1] = 0; continue; }
            double inf = GateSteadyState(g, v, ca);
            double tau = GateTimeConstantMs(g, v, ca);
            dy[g + 1] = (inf - y[g + 1]) / tau;
        }
        if (HasShell)
        {
            double ica = CalciumCurrent(v, x, ca);
            dy[GateCount + 1] = -ShellInflowPerCurrent * ica - (ca - ShellRestMm) / ShellDecayMs;
        }
    }

    public int StateLength => GateCount + (HasShell ? 2 : 1);

    public double[] Pack(CellState s)
    {
        var y = new double[StateLength];
        y[0] = s.VoltageMv;
        Array.Copy(s.Gates, 0, y, 1, GateCount);
        if (HasShell) y[GateCount + 1] = s.CalciumMm;
        return y;
    }

    public CellState Unpack(ReadOnlySpan<double> y) =>
        new(y[0], y.Slice(1, GateCount).ToArray(), HasShell ? y[GateCount + 1] : ShellRestMm);

    /// <summary>Names each gate as "entry-id.gate" for error messages.</summary>
    public string GateLabel(int g) => $"{Model.Channels[GateChannel[g]].Entry.Id}.{Gates[g].Name}";
}

/// <summary>A model that cannot be simulated, with the parameter at fault.</summary>
public sealed class ModelException(string message) : Exception(message);

/// <summary>
/// A simulation whose state left the physical range: names the time, the protocol step, the state and the
/// channel carrying the largest current, so the user can see which parameter to fix.
/// </summary>
public sealed class SimulationBlowUpException(string message, double timeMs, string channel, CellState state) : Exception(message)
{
    public double TimeMs { get; } = timeMs;
    public string Channel { get; } = channel;
    public CellState State { get; } = state;
}
