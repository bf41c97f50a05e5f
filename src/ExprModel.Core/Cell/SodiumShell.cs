namespace ExprModel.Core.Cell;

/// <summary>
/// A submembrane sodium shell filled by sodium currents and relaxing to rest, the sodium counterpart of
/// <see cref="CalciumShell"/> (d[Na]/dt = -I_Na / (F x depth) - ([Na] - rest) / decay; sodium is not buffered). It
/// feeds sodium-gated subunits (KNa, KCNT1/KCNT2) only; the sodium reversal potential stays the Nernst value of the
/// cell's ion concentrations (see DEVELOPERS.md, "Sodium"). Defaults are our settings: a 0.5 um shell and a 1 s
/// relaxation (from memory: the sodium pump clears accumulated sodium over about a second; the linearised pump of
/// Compte et al. 2003, J Neurophysiol 89:2707, relaxes with about 1.1 s around its 9.5 mM rest). Rest is the cell's
/// intracellular sodium unless given.
/// </summary>
public sealed record SodiumShell
{
    public double DepthUm { get; init; } = 0.5;
    public double DecayMs { get; init; } = 1000;
    /// <summary>Resting shell sodium (mM); null = the cell's <see cref="IonConcentrations.SodiumInsideMm"/>.</summary>
    public double? RestMm { get; init; }

    /// <summary>Returns a problem naming the field, or null.</summary>
    public string? Problem()
    {
        if (!(DepthUm > 0) || double.IsInfinity(DepthUm)) return $"sodiumShell.depthUm must be positive (got {DepthUm})";
        if (!(DecayMs > 0) || double.IsInfinity(DecayMs)) return $"sodiumShell.decayMs must be positive (got {DecayMs})";
        if (RestMm is { } r && (!(r > 0) || double.IsInfinity(r))) return $"sodiumShell.restMm must be positive (got {r})";
        return null;
    }
}
