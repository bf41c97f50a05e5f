using System.Text.RegularExpressions;

namespace ExprModel.Core.Expression.Metadata;

/// <summary>Splits a column header into a name and the unit it states: "Vrest (mV)", "rheobase [pA]", "input_resistance_MOhm".</summary>
public static partial class ColumnHeader
{
    [GeneratedRegex(@"^(?<name>.*?)\s*[\(\[](?<unit>[^\)\]]+)[\)\]]\s*$")]
    private static partial Regex Bracketed();

    /// <summary>Units accepted as a trailing "_unit" suffix; the electrophysiology units of the trade.</summary>
    private static readonly string[] SuffixUnits =
        ["mV", "V", "MOhm", "GOhm", "MΩ", "GΩ", "pA", "nA", "Hz", "ms", "s", "pF", "nS", "um2", "uA/cm2", "mS/cm2", "uF/cm2"];

    public static (string Name, string? Unit) Split(string header)
    {
        var h = header.Trim();
        var m = Bracketed().Match(h);
        if (m.Success && m.Groups["name"].Value.Length > 0) return (m.Groups["name"].Value, m.Groups["unit"].Value.Trim());
        foreach (var unit in SuffixUnits)
            if (h.Length > unit.Length + 1 && h.EndsWith("_" + unit, StringComparison.Ordinal))
                return (h[..^(unit.Length + 1)], unit);
        return (h, null);
    }
}
