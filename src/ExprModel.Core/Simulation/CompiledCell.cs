using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Simulation;

/// <summary>
/// A <see cref="CellModel"/> ready for the integrators: its <see cref="CellKinetics"/> (gates, reversal potentials,
/// shell, step plan, rate tables) and its channel densities. Built once per model and shared by every lane of a sweep;
/// a model that differs only in densities reuses the kinetics (<see cref="WithDensities"/>).
/// </summary>
public sealed class CompiledCell
{
    public CellModel Model { get; }
    /// <summary>Everything but the densities; shared by cells that differ only in densities.</summary>
    public CellKinetics Kinetics { get; }
    public int ChannelCount { get; }
    public int GateCount { get; }
    /// <summary>Maximal conductance density of each channel (mS/cm2), relative density applied.</summary>
    internal readonly double[] Gbar;
    internal readonly StepPlan Plan;
    internal double[] Erev => Kinetics.Erev;
    internal DriveMode[] Mode => Kinetics.Mode;
    internal bool[] GateIsInstantaneous => Kinetics.GateIsInstantaneous;
    internal double CapacitanceUfPerCm2 => Kinetics.CapacitanceUfPerCm2;
    internal bool HasShell => Kinetics.HasShell;
    internal double ShellInflowPerCurrent => Kinetics.ShellInflowPerCurrent;
    internal double ShellDecayMs => Kinetics.ShellDecayMs;
    internal double ShellRestMm => Kinetics.ShellRestMm;
    internal double CalciumOutsideMm => Kinetics.CalciumOutsideMm;
    internal double TemperatureC => Kinetics.TemperatureC;
    internal bool HasSodiumShell => Kinetics.HasSodiumShell;
    internal double SodiumInflowPerCurrent => Kinetics.SodiumInflowPerCurrent;
    internal double SodiumShellDecayMs => Kinetics.SodiumShellDecayMs;
    internal double SodiumShellRestMm => Kinetics.SodiumShellRestMm;

    public CompiledCell(CellModel model) : this(Checked(model), null) { }

    private CompiledCell(CellModel model, CellKinetics? kinetics)
    {
        Model = model;
        Kinetics = kinetics ?? new CellKinetics(model);
        ChannelCount = Kinetics.ChannelCount;
        GateCount = Kinetics.GateCount;
        Gbar = model.Channels.Select(c => c.EffectiveDensityMsPerCm2).ToArray();
        Plan = Kinetics.Plan;
    }

    /// <summary>
    /// The cell of <paramref name="model"/> on these kinetics, when the model differs from this cell's only in channel
    /// densities (<see cref="CellKinetics.Matches"/>); rate tables and step plan are shared, not built again.
    /// </summary>
    /// <exception cref="ArgumentException">The model differs in more than densities (compile it instead).</exception>
    public CompiledCell WithDensities(CellModel model)
    {
        if (!Kinetics.Matches(model))
            throw new ArgumentException("the model differs from the compiled cell in more than channel densities; compile it instead", nameof(model));
        return On(Kinetics, Checked(model));
    }

    /// <summary>A cell of <paramref name="model"/> (already checked, kinetics matching) on existing kinetics.</summary>
    internal static CompiledCell On(CellKinetics kinetics, CellModel model) => new(model, kinetics);

    internal static CellModel Checked(CellModel model) => model.Problem() is { } problem ? throw new ModelException(problem) : model;

    /// <summary>Identifies what this cell simulates: cells with equal keys give the same results.</summary>
    public CellKey Key => new(Kinetics.Id, Gbar);

    /// <summary>Channel names in model order, as "entry-id" (used to label recorded currents).</summary>
    public IReadOnlyList<string> ChannelIds => Model.Channels.Select(c => c.Entry.Id).ToArray();

    /// <summary>Steady state of gate g at V (mV), calcium and shell sodium (mM; NaN = resting shell sodium), with the channel's voltage shift.</summary>
    public double GateSteadyState(int g, double vMv, double calciumMm, double sodiumMm = double.NaN) =>
        Kinetics.GateSteadyState(g, vMv, calciumMm, double.IsNaN(sodiumMm) ? SodiumShellRestMm : sodiumMm);

    /// <summary>Time constant (ms) of gate g at V, scaled for temperature by Q10.</summary>
    public double GateTimeConstantMs(int g, double vMv) => Kinetics.GateTimeConstantMs(g, vMv);

    /// <summary>Time constant (ms) of gate g at V and intracellular calcium (BK-type gates depend on both).</summary>
    public double GateTimeConstantMs(int g, double vMv, double calciumMm) => Kinetics.GateTimeConstantMs(g, vMv, calciumMm);

    /// <summary>The state with V at <paramref name="vMv"/> and every gate at its steady state there.</summary>
    public CellState SteadyState(double vMv)
    {
        var x = new double[GateCount];
        for (int g = 0; g < GateCount; g++) x[g] = GateSteadyState(g, vMv, ShellRestMm, SodiumShellRestMm);
        return new CellState(vMv, x, ShellRestMm, SodiumShellRestMm);
    }

    public CellState InitialState() => SteadyState(Model.InitialVoltageMv);

    /// <summary>Conductance (mS/cm2) of channel c for the given gate values.</summary>
    internal double Conductance(int c, ReadOnlySpan<double> gates) => Plan.Conductance<ScalarLanes, double>(c, Gbar[c], gates);

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
            if (Plan.CarriesCalcium[c]) sum += ChannelCurrent(c, vMv, gates, calciumMm);
        return sum;
    }

    /// <summary>Total sodium current (uA/cm2) for the sodium shell: every channel of ion sodium.</summary>
    internal double SodiumCurrent(double vMv, ReadOnlySpan<double> gates, double calciumMm)
    {
        double sum = 0;
        for (int c = 0; c < ChannelCount; c++)
            if (Plan.CarriesSodium[c]) sum += ChannelCurrent(c, vMv, gates, calciumMm);
        return sum;
    }

    /// <summary>
    /// Right-hand side of the full ODE, y = [V, gates..., Ca (with a calcium shell), Na (with a sodium shell)], used by the reference integrators and the
    /// stability analysis. Instantaneous gates are held at their steady state (their derivative is zero).
    /// </summary>
    public void Derivatives(ReadOnlySpan<double> y, double stimulusUaPerCm2, Span<double> dy)
    {
        double v = y[0];
        double ca = HasShell ? y[GateCount + 1] : ShellRestMm;
        double na = HasSodiumShell ? y[SodiumIndex] : SodiumShellRestMm;
        Span<double> x = GateCount <= 64 ? stackalloc double[GateCount] : new double[GateCount];
        for (int g = 0; g < GateCount; g++)
            x[g] = GateIsInstantaneous[g] ? GateSteadyState(g, v, ca, na) : y[g + 1];
        double total = 0;
        for (int c = 0; c < ChannelCount; c++) total += ChannelCurrent(c, v, x, ca);
        dy[0] = (stimulusUaPerCm2 - total) / CapacitanceUfPerCm2;
        for (int g = 0; g < GateCount; g++)
        {
            if (GateIsInstantaneous[g]) { dy[g + 1] = 0; continue; }
            double inf = GateSteadyState(g, v, ca, na);
            double tau = GateTimeConstantMs(g, v, ca);
            dy[g + 1] = (inf - y[g + 1]) / tau;
        }
        if (HasShell)
        {
            double ica = CalciumCurrent(v, x, ca);
            dy[GateCount + 1] = -ShellInflowPerCurrent * ica - (ca - ShellRestMm) / ShellDecayMs;
        }
        if (HasSodiumShell)
        {
            double ina = SodiumCurrent(v, x, ca);
            dy[SodiumIndex] = -SodiumInflowPerCurrent * ina - (na - SodiumShellRestMm) / SodiumShellDecayMs;
        }
    }

    public int StateLength => GateCount + (HasShell ? 2 : 1) + (HasSodiumShell ? 1 : 0);

    /// <summary>Index of shell sodium in the packed state (after the calcium shell's, when there is one).</summary>
    private int SodiumIndex => GateCount + (HasShell ? 2 : 1);

    public double[] Pack(CellState s)
    {
        var y = new double[StateLength];
        y[0] = s.VoltageMv;
        Array.Copy(s.Gates, 0, y, 1, GateCount);
        if (HasShell) y[GateCount + 1] = s.CalciumMm;
        if (HasSodiumShell) y[SodiumIndex] = double.IsNaN(s.SodiumMm) ? SodiumShellRestMm : s.SodiumMm;
        return y;
    }

    public CellState Unpack(ReadOnlySpan<double> y) =>
        new(y[0], y.Slice(1, GateCount).ToArray(), HasShell ? y[GateCount + 1] : ShellRestMm, HasSodiumShell ? y[SodiumIndex] : SodiumShellRestMm);

    /// <summary>Names each gate as "entry-id.gate" for error messages.</summary>
    public string GateLabel(int g) => Kinetics.GateLabel(g);
}
