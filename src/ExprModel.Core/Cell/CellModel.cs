using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Cell;

/// <summary>Ionic concentrations (mM) inside and outside the cell.</summary>
public sealed record IonConcentrations
{
    public double SodiumInsideMm { get; init; } = 10;
    public double SodiumOutsideMm { get; init; } = 145;
    public double PotassiumInsideMm { get; init; } = 140;
    public double PotassiumOutsideMm { get; init; } = 5;
    public double CalciumInsideMm { get; init; } = 5e-5;
    public double CalciumOutsideMm { get; init; } = 2;
    public double ChlorideInsideMm { get; init; } = 10;
    public double ChlorideOutsideMm { get; init; } = 130;

    /// <summary>Mammalian artificial cerebrospinal fluid and a typical neuronal cytoplasm (common practice).</summary>
    public static IonConcentrations Mammalian { get; } = new();

    public string? Problem()
    {
        foreach (var (name, v) in new[] { ("sodiumInsideMm", SodiumInsideMm), ("sodiumOutsideMm", SodiumOutsideMm), ("potassiumInsideMm", PotassiumInsideMm),
            ("potassiumOutsideMm", PotassiumOutsideMm), ("calciumInsideMm", CalciumInsideMm), ("calciumOutsideMm", CalciumOutsideMm),
            ("chlorideInsideMm", ChlorideInsideMm), ("chlorideOutsideMm", ChlorideOutsideMm) })
            if (!(v > 0) || double.IsInfinity(v)) return $"{name} must be a positive number (got {v})";
        return null;
    }
}

/// <summary>
/// A thin submembrane calcium shell filled by calcium current and relaxing to rest (common practice). Only the
/// free fraction 1/(1 + BufferCapacity) of the entering calcium stays free (fast buffer approximation, Neher &amp;
/// Augustine 1992, J Physiol 450:273); a capacity of about 100 is typical of neuronal cytoplasm (from memory,
/// e.g. Helmchen et al. 1996, Biophys J 70:1069, reported 100-200 in dendrites).
/// </summary>
public sealed record CalciumShell
{
    public double DepthUm { get; init; } = 0.1;
    public double DecayMs { get; init; } = 80;
    public double RestMm { get; init; } = 5e-5;
    public double BufferCapacity { get; init; } = 100;
}

/// <summary>Single-compartment geometry: a sphere-equivalent membrane area and specific capacitance.</summary>
public sealed record Geometry
{
    public required double AreaUm2 { get; init; }
    public double CapacitanceUfPerCm2 { get; init; } = 1.0;

    public static Geometry FromDiameter(double diameterUm, double capacitanceUfPerCm2 = 1.0) =>
        new() { AreaUm2 = Math.PI * diameterUm * diameterUm, CapacitanceUfPerCm2 = capacitanceUfPerCm2 };

    /// <summary>Area from a measured whole-cell capacitance (pF): A = C / c_m, with 1 uF/cm2 = 0.01 pF/um2.</summary>
    public static Geometry FromCapacitance(double capacitancePf, double capacitanceUfPerCm2 = 1.0) =>
        new() { AreaUm2 = capacitancePf / (capacitanceUfPerCm2 * 0.01), CapacitanceUfPerCm2 = capacitanceUfPerCm2 };

    public double AreaCm2 => AreaUm2 * 1e-8;
    public double CapacitancePf => CapacitanceUfPerCm2 * 0.01 * AreaUm2;

    /// <summary>Converts an absolute current (pA) to density (uA/cm2): 1 uA/cm2 on 1000 um2 is 10 pA.</summary>
    public double PicoampsToDensity(double pA) => pA * 100.0 / AreaUm2;
    public double DensityToPicoamps(double uaPerCm2) => uaPerCm2 * AreaUm2 / 100.0;
}

/// <summary>One channel entry placed in a cell at a density.</summary>
public sealed record ChannelInstance
{
    public required ChannelEntry Entry { get; init; }
    /// <summary>Maximal conductance density predicted or chosen for this cell (mS/cm2), before the relative density scales it.</summary>
    public required double DensityMsPerCm2 { get; init; }
    /// <summary>The factor the user scales the density by (a knock-down below 1, over-expression above); 1 = as predicted.</summary>
    public double RelativeDensity { get; init; } = 1;
    /// <summary>Overrides the entry's reversal rule with a fixed reversal (mV), as a published model does.</summary>
    public double? ReversalMv { get; init; }
    /// <summary>Shifts every gate of this channel along the voltage axis by this amount (mV).</summary>
    public double ShiftMv { get; init; }
    /// <summary>Multiplies every gate time constant of this channel (a published model's fitted slowing, e.g. tau_max of an M-current).</summary>
    public double TauScale { get; init; } = 1;

    public double EffectiveDensityMsPerCm2 => DensityMsPerCm2 * RelativeDensity;
}

/// <summary>A complete single-compartment conductance-based cell, ready to compile and simulate.</summary>
public sealed record CellModel
{
    public string Name { get; init; } = "cell";
    public required Geometry Geometry { get; init; }
    public double TemperatureC { get; init; } = 36;
    public IonConcentrations Ions { get; init; } = IonConcentrations.Mammalian;
    public CalciumShell? CalciumShell { get; init; }
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

    /// <summary>Returns a problem naming the parameter, or null when the model can be simulated.</summary>
    public string? Problem()
    {
        if (!(Geometry.AreaUm2 > 0) || double.IsInfinity(Geometry.AreaUm2)) return "cell.areaUm2 must be positive";
        if (!(Geometry.CapacitanceUfPerCm2 > 0)) return "cell.capacitanceUfPerCm2 must be positive";
        if (TemperatureC < -5 || TemperatureC > 50 || double.IsNaN(TemperatureC)) return $"temperatureC must lie between -5 and 50 (got {TemperatureC})";
        if (Ions.Problem() is { } p) return "ions." + p;
        if (Channels.Count == 0) return "the model has no channels";
        foreach (var c in Channels)
        {
            if (c.Entry.Problem() is { } e) return e;
            if (!(c.DensityMsPerCm2 >= 0) || double.IsInfinity(c.DensityMsPerCm2)) return $"channel {c.Entry.Key}: densityMsPerCm2 must be >= 0";
            if (!(c.RelativeDensity >= 0) || double.IsInfinity(c.RelativeDensity)) return $"channel {c.Entry.Key}: relativeDensity must be >= 0";
            if (!(c.TauScale > 0) || double.IsInfinity(c.TauScale)) return $"channel {c.Entry.Key}: tauScale must be > 0";
            if (c.Entry.Gates.Any(g => g.Kind == GateKind.Calcium) && CalciumShell is null) return $"channel {c.Entry.Key}: calcium-gated, so the model needs a calciumShell";
        }
        return null;
    }
}
