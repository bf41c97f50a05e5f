namespace ExprModel.Core.Kinetics;

/// <summary>
/// One versioned, immutable kinetic entry of the catalog. A changed entry is a new version; saved
/// models pin (Id, Version) so they never change under a user's feet.
/// </summary>
public sealed record ChannelEntry
{
    public required string Id { get; init; }
    public required int Version { get; init; }
    public required string Name { get; init; }
    /// <summary>Channel family code, e.g. "Nav-transient", "Kv3", "HCN" (see <see cref="ChannelFamilies"/>).</summary>
    public required string Family { get; init; }
    public required Ion Ion { get; init; }
    public ReversalRule Reversal { get; init; } = ReversalRule.Nernst;
    /// <summary>Reversal potential for <see cref="ReversalRule.Fixed"/> (mV).</summary>
    public double? ReversalMv { get; init; }
    public required IReadOnlyList<GateSpec> Gates { get; init; }
    /// <summary>Temperature (deg C) at which the kinetics were measured or fitted.</summary>
    public required double ReferenceTemperatureC { get; init; }
    public double Q10 { get; init; } = 3;
    public required double TypicalDensityMsPerCm2 { get; init; }
    public required double MinDensityMsPerCm2 { get; init; }
    public required double MaxDensityMsPerCm2 { get; init; }
    public required Citation Source { get; init; }
    public string Preparation { get; init; } = "";
    public string CuratorNote { get; init; } = "";
    public IReadOnlyList<PublishedValue> PublishedValues { get; init; } = [];
    /// <summary>The conductance as the source paper states it, when it states one; the typical density should follow it.</summary>
    public SourceDensity? SourceDensity { get; init; }

    public string Key => $"{Id}@{Version}";

    /// <summary>Rate multiplier at <paramref name="temperatureC"/>: Q10^((T - T_ref)/10) (common practice).</summary>
    public double TemperatureFactor(double temperatureC) => Math.Pow(Q10, (temperatureC - ReferenceTemperatureC) / 10.0);

    /// <summary>Steady-state open fraction, product of gate steady states raised to their powers.</summary>
    public double SteadyStateOpenFraction(double vMv, double calciumMm = 5e-5)
    {
        double p = 1;
        foreach (var g in Gates) p *= Math.Pow(g.SteadyStateAt(vMv, calciumMm), g.Power);
        return p;
    }

    /// <summary>Returns the first problem found, naming entry and parameter, or null when the entry is usable.</summary>
    public string? Problem()
    {
        if (string.IsNullOrWhiteSpace(Id)) return "entry id is empty";
        if (Version < 1) return $"{Key}: version must be 1 or more";
        if (Reversal == ReversalRule.Fixed && ReversalMv is null) return $"{Key}: reversal rule 'fixed' needs reversalMv";
        if (Reversal == ReversalRule.Nernst && Ion is Ion.Cation or Ion.Nonspecific) return $"{Key}: a {Ion} channel needs a fixed reversal";
        if (Reversal == ReversalRule.GoldmanHodgkinKatz && Ion != Ion.Calcium) return $"{Key}: the GHK rule is implemented for calcium only";
        if (!(Q10 > 0)) return $"{Key}: q10 must be positive";
        if (!(MinDensityMsPerCm2 >= 0 && MinDensityMsPerCm2 <= TypicalDensityMsPerCm2 && TypicalDensityMsPerCm2 <= MaxDensityMsPerCm2))
            return $"{Key}: density must satisfy 0 <= min <= typical <= max";
        if (SourceDensity?.Problem() is { } d) return $"{Key}: {d}";
        if (Source.CitationCheck == CitationCheck.Confirmed
            && !(Uri.TryCreate(Source.CitationCheckedAt, UriKind.Absolute, out var page) && page.Scheme is "http" or "https"))
            return $"{Key}: source.citation 'confirmed' needs source.citationCheckedAt, the web address of the abstract page";
        if (Source.CitationCheck == CitationCheck.NotFound && string.IsNullOrWhiteSpace(Source.CitationNote))
            return $"{Key}: source.citation 'not-found' needs source.citationNote saying what was searched";
        foreach (var g in Gates)
            if (g.Problem() is { } p) return $"{Key}: {p}";
        return null;
    }
}
