using System.Globalization;

namespace ExprModel.Core.Export;

/// <summary>
/// How a read-out is shown to a person: to the resolution its unit is read at, in plain decimals. A value smaller than
/// half that resolution is shown as 0 (a sag ratio of 1e-12 is a sag of none, not a number to read in E-notation).
/// Exports keep full precision; this is for tables on screen and in the terminal.
/// </summary>
public static class ReadoutDisplay
{
    /// <summary>Decimal places per unit, at about the resolution of a careful recording or of the search that measures it.</summary>
    private static readonly Dictionary<string, int> DecimalsByUnit = new(StringComparer.Ordinal)
    {
        ["mV"] = 2,
        ["ms"] = 2,
        ["MOhm"] = 1,
        ["fraction"] = 3,
        ["uA/cm2"] = 4,
        ["pA"] = 1,
        ["nA"] = 3,
        ["Hz"] = 2,
        ["Hz/nA"] = 1,
        ["Hz per uA/cm2"] = 2,
        ["mV/ms"] = 1,
        ["0/1"] = 0,
        ["1 or 2"] = 0,
        ["last/first ISI"] = 3,
        ["mean normalised ISI change"] = 3,
        ["um2"] = 0,
        ["pF"] = 2,
        ["mS/cm2"] = 4,
    };

    /// <summary>Significant digits for a unit this table does not know.</summary>
    private const int FallbackSignificant = 4;

    /// <summary>The decimal places <paramref name="unit"/> is shown with, or null when the unit is not known.</summary>
    public static int? Decimals(string unit) => DecimalsByUnit.TryGetValue(unit, out int d) ? d : null;

    /// <summary>The value in <paramref name="unit"/> as shown; "—" when it is not defined.</summary>
    public static string Format(double? value, string unit) => Decimals(unit) is { } d ? Fixed(value, d) : Format(value);

    /// <summary>A value of unknown resolution: four significant digits in plain decimals, E-notation only outside 1e-6..1e9.</summary>
    public static string Format(double? value)
    {
        if (value is not { } x || double.IsNaN(x)) return "—";
        if (double.IsInfinity(x)) return x > 0 ? "∞" : "−∞";
        double a = Math.Abs(x);
        if (a == 0) return "0";
        if (a < 1e-6 || a >= 1e9) return x.ToString("G3", CultureInfo.InvariantCulture);
        int decimals = Math.Clamp(FallbackSignificant - 1 - (int)Math.Floor(Math.Log10(a)), 0, 10);
        return Fixed(x, decimals);
    }

    private static string Fixed(double? value, int decimals)
    {
        if (value is not { } x || double.IsNaN(x)) return "—";
        if (double.IsInfinity(x)) return x > 0 ? "∞" : "−∞";
        double r = Math.Round(x, decimals, MidpointRounding.AwayFromZero);
        if (r == 0) return "0";
        if (Math.Abs(r) >= 1e9) return r.ToString("G4", CultureInfo.InvariantCulture);
        return r.ToString(decimals == 0 ? "0" : "0." + new string('#', decimals), CultureInfo.InvariantCulture);
    }
}
