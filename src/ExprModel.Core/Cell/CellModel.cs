using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Cell;

/// <summary>A complete single-compartment conductance-based cell, ready to compile and simulate.</summary>
public sealed record CellModel
{
    public string Name { get; init; } = "cell";
    public required Geometry Geometry { get; init; }
    public double TemperatureC { get; init; } = 36;
    public IonConcentrations Ions { get; init; } = IonConcentrations.Mammalian;
    public CalciumShell? CalciumShell { get; init; }
    /// <summary>The sodium shell; when null and a channel has a sodium-gated subunit, the default shell is used (<see cref="EffectiveSodiumShell"/>).</summary>
    public SodiumShell? SodiumShell { get; init; }
    public required IReadOnlyList<ChannelInstance> Channels { get; init; }
    /// <summary>Initial membrane potential (mV); gates start at their steady state there.</summary>
    public double InitialVoltageMv { get; init; } = -65;

    /// <summary>Reversal potential (mV) of a channel in this cell (for GHK channels, the Nernst value for reporting).</summary>
    public double ReversalPotentialMv(ChannelInstance c)
    {
        if (c.ReversalMv is { } fixedMv) return fixedMv;
        if (c.Entry.Reversal == ReversalRule.Fixed) return c.Entry.ReversalMv!.Value;
        return c.Entry.Ion switch
        {
            Ion.Sodium => Nernst.PotentialMv(Ions.SodiumOutsideMm, Ions.SodiumInsideMm, 1, TemperatureC),
            Ion.Potassium => Nernst.PotentialMv(Ions.PotassiumOutsideMm, Ions.PotassiumInsideMm, 1, TemperatureC),
            Ion.Calcium => Nernst.PotentialMv(Ions.CalciumOutsideMm, CalciumShell?.RestMm ?? Ions.CalciumInsideMm, 2, TemperatureC),
            Ion.Chloride => Nernst.PotentialMv(Ions.ChlorideOutsideMm, Ions.ChlorideInsideMm, -1, TemperatureC),
            _ => throw new InvalidOperationException($"{c.Entry.Key}: a {c.Entry.Ion} channel needs a fixed reversal."),
        };
    }

    /// <summary>True when some channel has a sodium-gated subunit.</summary>
    public bool HasSodiumGatedChannel => Channels.Any(c => c.Entry.Gates.Any(g => g.Kind == GateKind.Sodium));

    /// <summary>The sodium shell the simulator uses: the model's, or the default one when a sodium-gated channel needs it; else null.</summary>
    public SodiumShell? EffectiveSodiumShell => SodiumShell ?? (HasSodiumGatedChannel ? new SodiumShell() : null);

    /// <summary>Resting shell sodium (mM): the shell's rest, or the cell's intracellular sodium.</summary>
    public double SodiumShellRestMm => SodiumShell?.RestMm ?? Ions.SodiumInsideMm;

    /// <summary>The temperatures a model may be simulated at (C): the one range every door checks (model files, builds, the API).</summary>
    public const double LowestTemperatureC = -5, HighestTemperatureC = 50;

    /// <summary>A problem naming temperatureC when <paramref name="temperatureC"/> lies outside the simulated range, else null.</summary>
    public static string? TemperatureProblem(double temperatureC) =>
        temperatureC is >= LowestTemperatureC and <= HighestTemperatureC ? null
            : $"temperatureC must lie between {LowestTemperatureC} and {HighestTemperatureC} (got {temperatureC})";

    /// <summary>Returns a problem naming the parameter, or null when the model can be simulated.</summary>
    public string? Problem()
    {
        if (!(Geometry.AreaUm2 > 0) || double.IsInfinity(Geometry.AreaUm2)) return "cell.areaUm2 must be positive";
        if (!(Geometry.CapacitanceUfPerCm2 > 0)) return "cell.capacitanceUfPerCm2 must be positive";
        if (TemperatureProblem(TemperatureC) is { } t) return t;
        if (Ions.Problem() is { } p) return "ions." + p;
        if (SodiumShell?.Problem() is { } sp) return sp;
        if (Channels.Count == 0) return "the model has no channels";
        foreach (var c in Channels)
        {
            if (c.Entry.Problem() is { } e) return e;
            if (!(c.DensityMsPerCm2 >= 0) || double.IsInfinity(c.DensityMsPerCm2)) return $"channel {c.Entry.Key}: densityMsPerCm2 must be >= 0";
            if (!(c.RelativeDensity >= 0) || double.IsInfinity(c.RelativeDensity)) return $"channel {c.Entry.Key}: relativeDensity must be >= 0";
            if (!(c.TauScale > 0) || double.IsInfinity(c.TauScale)) return $"channel {c.Entry.Key}: tauScale must be > 0";
            if (c.Entry.Gates.Any(g => g.Kind == GateKind.Calcium) && CalciumShell is null)
                return $"channel {c.Entry.Key}: calcium-gated, so the model needs a calciumShell";
        }
        return null;
    }
}
