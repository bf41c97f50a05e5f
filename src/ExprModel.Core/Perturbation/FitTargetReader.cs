using System.Globalization;
using System.Text.RegularExpressions;

namespace ExprModel.Core.Perturbation;

/// <summary>
/// Reads fit targets typed as <c>name=value[unit]</c> (e.g. <c>rheobase=45pA</c>, <c>resting_potential=-68 mV</c>) or
/// from a targets table: CSV with the columns <c>readout,value,unit[,scale]</c>, a header line, '#' comment lines.
/// A unit, when given, must be the read-out's unit; "rheobase" and "fi_gain" in absolute units (pA, Hz/nA) are read as
/// their absolute read-outs. Errors name the line and column, or the typed text.
/// </summary>
public static partial class FitTargetReader
{
    [GeneratedRegex(@"^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$")]
    private static partial Regex NumberThenUnit();

    /// <summary>One typed target, e.g. "rheobase=0.12 uA/cm2" or "input_resistance=180MOhm".</summary>
    public static FitTarget ParseTyped(string text, double? scale = null)
    {
        int eq = text.IndexOf('=');
        if (eq <= 0) throw new ArgumentException($"target '{text}': write NAME=VALUE[UNIT], e.g. rheobase=45pA.");
        var m = NumberThenUnit().Match(text[(eq + 1)..]);
        if (!m.Success || !double.TryParse(m.Groups[1].Value, NumberStyles.Float, CultureInfo.InvariantCulture, out var value) || !double.IsFinite(value))
            throw new ArgumentException($"target '{text}': '{text[(eq + 1)..].Trim()}' does not start with a number.");
        return Make(text[..eq].Trim(), value, m.Groups[2].Value, scale, $"target '{text}'");
    }

    /// <summary>A targets table (see the class summary); <paramref name="fileName"/> names it in errors.</summary>
    public static IReadOnlyList<FitTarget> ReadCsv(string text, string fileName)
    {
        var targets = new List<FitTarget>();
        int line = 0;
        bool header = false;
        foreach (var raw in text.Split('\n'))
        {
            line++;
            var s = raw.TrimEnd('\r');
            if (s.Trim().Length == 0 || s.TrimStart().StartsWith('#')) continue;
            var cols = s.Split(',').Select(c => c.Trim()).ToArray();
            if (!header)
            {
                header = true;
                if (cols[0].Equals("readout", StringComparison.OrdinalIgnoreCase)) continue;
                throw new ArgumentException($"{fileName}: line {line}: the first line must be the header readout,value,unit[,scale].");
            }
            string where = $"{fileName}: line {line}";
            if (cols.Length is < 3 or > 4) throw new ArgumentException($"{where}: expected 3 or 4 columns (readout,value,unit[,scale]), found {cols.Length}.");
            if (!double.TryParse(cols[1], NumberStyles.Float, CultureInfo.InvariantCulture, out var value) || !double.IsFinite(value))
                throw new ArgumentException($"{where}, column 2: '{cols[1]}' is not a number.");
            double? scale = null;
            if (cols.Length == 4 && cols[3].Length > 0)
            {
                if (!double.TryParse(cols[3], NumberStyles.Float, CultureInfo.InvariantCulture, out var sc) || !(sc > 0) || double.IsInfinity(sc))
                    throw new ArgumentException($"{where}, column 4: scale '{cols[3]}' must be a positive number.");
                scale = sc;
            }
            var t = Make(cols[0], value, cols[2], scale, where + ", column 1");
            if (targets.Any(x => x.Readout == t.Readout)) throw new ArgumentException($"{where}: {t.Readout} is given twice.");
            targets.Add(t);
        }
        if (targets.Count == 0) throw new ArgumentException($"{fileName}: no targets (expected a header readout,value,unit[,scale] and one line per " +
            "read-out).");
        return targets;
    }

    private static FitTarget Make(string name, double value, string unit, double? scale, string where)
    {
        var readout = name;
        if (unit.Length > 0 && !SameUnit(unit, ReadoutValues.UnitOf(readout)))
        {
            if (ReadoutValues.UnitOf(readout + "_absolute") is { } abs && SameUnit(unit, abs)) readout += "_absolute";
        }
        var expected = ReadoutValues.UnitOf(readout)
            ?? throw new ArgumentException($"{where}: '{name}' is not a read-out (read-outs: {string.Join(", ", ReadoutValues.Names.Select(n => n.Name))}).");
        if (ReadoutScales.KindOf(readout) == ElasticityKind.None) throw new ArgumentException($"{where}: '{readout}' is discrete and cannot be fitted.");
        if (unit.Length > 0 && !SameUnit(unit, expected)) throw new ArgumentException($"{where}: {readout} is in {expected}, not '{unit}'.");
        if (scale is { } s && !(s > 0)) throw new ArgumentException($"{where}: the scale must be positive.");
        return scale is { } given ? new FitTarget(readout, value, given) : FitTarget.WithDefaultScale(readout, value);
    }

    private static bool SameUnit(string a, string? b) => b is not null &&
        string.Equals(a.Replace(" ", "").Replace("Ω", "Ohm"), b.Replace(" ", ""), StringComparison.OrdinalIgnoreCase);
}
