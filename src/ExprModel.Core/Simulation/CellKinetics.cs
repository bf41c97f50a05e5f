using System.Collections.Concurrent;
using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Simulation;

/// <summary>
/// Everything a compiled cell needs except its channel densities: the gates with their voltage shifts and temperature
/// factors, reversal potentials, the calcium shell, the <see cref="StepPlan"/> the loops read and the rate tables per
/// step size. Densities scale currents but never a gate's rates, so cells that differ only in densities (every
/// relative-density move) share one instance and its tables (<see cref="CompiledCell.WithDensities"/>, <see cref="KineticsCache"/>).
/// </summary>
public sealed class CellKinetics
{
    private static long _nextId;
    private readonly CellModel _source;
    private readonly ConcurrentDictionary<double, Lazy<RateTable>> _tables = new();
    private int _rateTablesBuilt;

    /// <summary>Distinct per instance for the process's lifetime: cells with the same id and densities simulate alike.</summary>
    public long Id { get; } = Interlocked.Increment(ref _nextId);
    public int ChannelCount { get; }
    public int GateCount { get; }
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
    /// <summary>Gates computed per step from a shell concentration (calcium or sodium), not tabulated by voltage.</summary>
    internal readonly bool[] GateIsConcentrationGated;
    internal readonly bool[] GateIsInstantaneous;
    internal readonly bool[] CarriesCalcium;
    internal readonly double CapacitanceUfPerCm2;
    internal readonly bool HasShell;
    /// <summary>mM/ms of free calcium per uA/cm2 of inward calcium current: 10 / (2 F d[um] (1 + kappa)) (see <see cref="CalciumShell"/>).</summary>
    internal readonly double ShellInflowPerCurrent;
    internal readonly double ShellDecayMs;
    internal readonly double ShellRestMm;
    /// <summary>True when the cell has a sodium shell (a sodium-gated channel, or a sodiumShell in the model).</summary>
    internal readonly bool HasSodiumShell;
    /// <summary>mM/ms of shell sodium per uA/cm2 of inward sodium current: 10 / (F d[um]) (see <see cref="SodiumShell"/>).</summary>
    internal readonly double SodiumInflowPerCurrent;
    internal readonly double SodiumShellDecayMs;
    internal readonly double SodiumShellRestMm;
    /// <summary>Channels whose current fills the sodium shell: those of ion sodium.</summary>
    internal readonly bool[] CarriesSodium;
    internal readonly double CalciumOutsideMm;
    internal readonly double TemperatureC;
    /// <summary>What every loop reads per step: gate kinds, Hill and calcium-bound rate constants, drive modes.</summary>
    internal readonly StepPlan Plan;

    /// <summary>Compiles the kinetics of <paramref name="model"/>; the model must have passed <see cref="CellModel.Problem"/>.</summary>
    internal CellKinetics(CellModel model)
    {
        _source = model;
        ChannelCount = model.Channels.Count;
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
            Erev[c] = model.ReversalPotentialMv(ch);
            Mode[c] = ch.ReversalMv is null && ch.Entry.Ion == Ion.Calcium && model.CalciumShell is not null
                ? ch.Entry.Reversal == ReversalRule.GoldmanHodgkinKatz ? DriveMode.GhkCalcium
                    : ch.Entry.Reversal == ReversalRule.Nernst ? DriveMode.NernstCalcium
                    : DriveMode.Ohmic
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
        GateIsConcentrationGated = Gates.Select(g => g.Kind is GateKind.Calcium or GateKind.Sodium).ToArray();
        GateIsInstantaneous = Gates.Select(g => g.Instantaneous).ToArray();
        CarriesCalcium = model.Channels.Select(ch => ch.Entry.Ion == Ion.Calcium).ToArray();
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
        CarriesSodium = model.Channels.Select(ch => ch.Entry.Ion == Ion.Sodium).ToArray();
        SodiumShellRestMm = model.SodiumShellRestMm;
        if (model.EffectiveSodiumShell is { } sodium)
        {
            HasSodiumShell = true;
            // 1 uA/cm2 for 1 ms into a shell of depth d um: 1e-9 C/cm2 / F mol over d x 1e-4 cm3... = 10 / (F d) mM.
            SodiumInflowPerCurrent = 10.0 / (PhysicalConstants.Faraday * sodium.DepthUm);
            SodiumShellDecayMs = sodium.DecayMs;
        }
        Plan = new StepPlan(this);
    }

    /// <summary>Rate tables built for this kinetics so far (one per step size used); counted so tests can see reuse.</summary>
    public int RateTablesBuilt => Volatile.Read(ref _rateTablesBuilt);

    /// <summary>The rate tables for step <paramref name="dtMs"/>, built on first use and kept with the kinetics.</summary>
    internal RateTable TableFor(double dtMs) =>
        _tables.GetOrAdd(dtMs, dt => new Lazy<RateTable>(() =>
        {
            Interlocked.Increment(ref _rateTablesBuilt);
            return new RateTable(this, dt);
        })).Value;

    /// <summary>
    /// True when <paramref name="model"/> differs from the model these kinetics were compiled from in channel densities
    /// (absolute or relative) and name only, so a cell of it can share them.
    /// </summary>
    public bool Matches(CellModel model)
    {
        if (ReferenceEquals(model, _source)) return true;
        if (model.Geometry != _source.Geometry || model.TemperatureC != _source.TemperatureC || model.Ions != _source.Ions
            || model.CalciumShell != _source.CalciumShell || model.SodiumShell != _source.SodiumShell || model.InitialVoltageMv != _source.InitialVoltageMv
            || model.Channels.Count != ChannelCount)
            return false;
        for (int c = 0; c < ChannelCount; c++)
        {
            var (a, b) = (model.Channels[c], _source.Channels[c]);
            if (a.ReversalMv != b.ReversalMv || a.ShiftMv != b.ShiftMv || a.TauScale != b.TauScale || !SameKinetics(a.Entry, b.Entry)) return false;
        }
        return true;
    }

    private static bool SameKinetics(ChannelEntry a, ChannelEntry b) =>
        ReferenceEquals(a, b)
        || (a.Id == b.Id && a.Version == b.Version && a.Ion == b.Ion && a.Reversal == b.Reversal && a.ReversalMv == b.ReversalMv
            && a.ReferenceTemperatureC == b.ReferenceTemperatureC && a.Q10 == b.Q10 && a.Gates.SequenceEqual(b.Gates));

    /// <summary>Steady state of gate g at V (mV), calcium and shell sodium (mM), with the channel's voltage shift.</summary>
    internal double GateSteadyState(int g, double vMv, double calciumMm, double sodiumMm) =>
        Plan.Update[g] switch
        {
            GateUpdate.CalciumHill => Plan.HillSteadyState<ScalarLanes, double>(g, calciumMm),
            GateUpdate.SodiumHill => Plan.HillSteadyState<ScalarLanes, double>(g, sodiumMm),
            _ => Gates[g].SteadyStateAt(vMv - GateShiftMv[g], calciumMm),
        };

    /// <summary>Time constant (ms) of gate g at V and intracellular calcium, scaled for temperature by Q10.</summary>
    internal double GateTimeConstantMs(int g, double vMv, double calciumMm) =>
        Gates[g].TimeConstantAt(vMv - GateShiftMv[g], calciumMm) / GateTemperatureFactor[g];

    /// <summary>Time constant (ms) of gate g at V (calcium-dependent rates at resting calcium), scaled for temperature.</summary>
    internal double GateTimeConstantMs(int g, double vMv) => Gates[g].TimeConstantAt(vMv - GateShiftMv[g]) / GateTemperatureFactor[g];

    /// <summary>Names each gate as "entry-id.gate" for error messages.</summary>
    internal string GateLabel(int g) => $"{_source.Channels[GateChannel[g]].Entry.Id}.{Gates[g].Name}";
}
