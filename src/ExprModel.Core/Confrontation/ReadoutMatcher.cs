using System.Globalization;
using System.Text;
using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Expression;
using ExprModel.Core.Expression.Metadata;

namespace ExprModel.Core.Confrontation;

/// <summary>
/// Matches the columns of a recorded table to read-outs by header name, with the unit in the header: the header's name
/// written in lower case with underscores ("resting potential (mV)" gives resting_potential) names a read-out of
/// <see cref="CellReadouts.Rows"/>, or its absolute-current form (rheobase (pA) is rheobase_absolute, rheobase (uA/cm2)
/// is rheobase), whichever the stated unit measures. The user can override any column (COLUMN=READOUT, or
/// COLUMN=none to leave it out). Every column gets a reason; bad input is an error naming file, line and column.
/// </summary>
public static class ReadoutMatcher
{
    /// <summary>Columns whose names sound like a read-out but whose recorded definition differs from the model's.</summary>
    private static readonly Dictionary<string, string> DifferentDefinitions = new(StringComparer.Ordinal)
    {
        ["max_firing_rate"] = MaxRateReason,
        ["maximum_firing_rate"] = MaxRateReason,
        ["maximal_firing_rate"] = MaxRateReason,
        ["max_rate"] = MaxRateReason,
    };

    private const string MaxRateReason = "no read-out has this definition: a recorded maximum rate is the highest rate over the lab's own step family "
        + "(its range, and whether it reached depolarisation block, are not in the table); the model's f-I curve spans steps up to 3x its rheobase, "
        + "so its highest whole-step rate depends on that range, not on the cell. Compare rates at stated step amplitudes instead.";

    /// <summary>Every read-out's name and unit, in the order of <see cref="CellReadouts.Rows"/>.</summary>
    public static IReadOnlyList<(string Name, string Unit)> Readouts { get; } = new CellReadouts().Rows().Select(r => (r.Name, r.Unit)).ToArray();

    /// <param name="isExpressionCell">True for a cell id of the expression table; a recorded cell that is not is an error.</param>
    /// <param name="overrides">Column (header, or header without its unit) to read-out name, or to "none".</param>
    /// <exception cref="ExpressionFormatException">Unknown unit of a matched column, a value that is not a number, a
    /// cell not in the expression table.</exception>
    /// <exception cref="ArgumentException">An override naming no column or no read-out, or joining units that do not convert.</exception>
    public static RecordedFeatures Match(RecordedFeatureTable table, Func<string, bool> isExpressionCell, IReadOnlyDictionary<string, string>? overrides = null)
    {
        var byColumn = ResolveOverrides(table, overrides ?? new Dictionary<string, string>());
        var matches = new List<ReadoutMatch>();
        var readouts = new List<RecordedReadout>();
        var taken = new Dictionary<string, string>(StringComparer.Ordinal);
        for (int j = 0; j < table.Headers.Count; j++)
        {
            if (j == table.CellIdColumnNumber - 1) continue;
            var (match, values) = MatchColumn(table, j, byColumn.GetValueOrDefault(j));
            if (match.Readout is { } name && taken.TryGetValue(name, out var earlier))
                match = match with
                {
                    Readout = null,
                    ReadoutUnit = null,
                    Reason = $"read-out {name} is already matched to column '{earlier}'; map one of them elsewhere or to none."
                };
            matches.Add(match);
            if (match.Readout is null || values is null) continue;
            taken[match.Readout] = match.Header;
            readouts.Add(new RecordedReadout(match.Readout, match.Header, MeasurementUnits.Parse(match.ColumnUnit)!,
                MeasurementUnits.Parse(match.ReadoutUnit)!, values));
        }
        var recorded = new List<string>();
        for (int i = 0; i < table.CellIds.Count; i++)
        {
            string cell = table.CellIds[i];
            if (!readouts.Any(r => r.ValueByCell.ContainsKey(cell))) continue;
            if (!isExpressionCell(cell))
                throw new ExpressionFormatException($"{table.Source}: line {table.Lines[i]}, column {table.CellIdColumnNumber}: cell '{cell}' has recorded " +
                    "values but is not in the expression table.");
            recorded.Add(cell);
        }
        return new RecordedFeatures { Source = table.Source, Matches = matches, Readouts = readouts, RecordedCells = recorded, Notes = table.Notes };
    }

    /// <summary>The read-out name a header's name stands for: lower case, every run of other characters an underscore.</summary>
    public static string Key(string name)
    {
        var sb = new StringBuilder();
        foreach (char c in name.Trim().ToLowerInvariant())
            if (char.IsAsciiLetterOrDigit(c)) sb.Append(c);
            else if (sb.Length > 0 && sb[^1] != '_') sb.Append('_');
        return sb.ToString().Trim('_');
    }

    private static (ReadoutMatch Match, Dictionary<string, double>? Values) MatchColumn(RecordedFeatureTable table, int j, string? chosen)
    {
        string header = table.Headers[j];
        var (name, unitText) = ColumnHeader.Split(header);
        bool byUser = chosen is not null;
        ReadoutMatch Out(string reason) => new(j + 1, header, null, unitText, null, byUser, reason);
        if (chosen is "none") return (Out("left out by the user."), null);

        string key = Key(name);
        var candidates = chosen is not null
            ? Readouts.Where(r => r.Name == chosen).ToArray()
            : Readouts.Where(r => r.Name == key || r.Name == key + "_absolute").ToArray();
        bool anyValue = table.Rows.Any(row => !CellMetadataReader.Missing.Contains(row[j].Trim()));
        if (!byUser && candidates.Length == 0)
        {
            if (!anyValue) return (Out("empty column."), null);
            if (!IsNumeric(table, j)) return (Out("text, not numbers (a label column)."), null);
            return (Out(DifferentDefinitions.TryGetValue(key, out var why) ? why
                : $"no read-out is named '{key}' (map it with {header}=READOUT if one measures the same)."), null);
        }
        if (unitText is null)
        {
            if (byUser) throw new ArgumentException($"{table.Source}: column '{header}' states no unit; write it in the header, e.g. '{name} (mV)', to map " +
                "it.");
            return (Out($"the header states no unit; write it as '{name} (unit)' to compare it with {candidates[0].Name}."), null);
        }
        var unit = MeasurementUnits.Parse(unitText)
            ?? throw new ExpressionFormatException($"{table.Source}: line 1, column {j + 1}: unknown unit '{unitText}' in header '{header}' (known: " +
                $"{MeasurementUnits.KnownSymbols}).");
        var same = candidates.FirstOrDefault(c => MeasurementUnits.CanConvert(unit, MeasurementUnits.Parse(c.Unit)!, withArea: false));
        var withArea = candidates.FirstOrDefault(c => MeasurementUnits.CanConvert(unit, MeasurementUnits.Parse(c.Unit)!, withArea: true));
        var target = same.Name is not null ? same : withArea;
        if (target.Name is null)
        {
            string what = string.Join(" or ", candidates.Select(c => $"{c.Name} ({c.Unit})"));
            if (byUser) throw new ArgumentException($"{table.Source}: column '{header}' is in {unitText} ({unit.Quantity}); read-out {what} cannot be " +
                "compared with it.");
            return (Out($"its unit {unitText} ({unit.Quantity}) does not measure {what}."), null);
        }
        var values = Parse(table, j);
        string rule = byUser ? $"mapped by the user to {target.Name}" : $"name '{key}' with unit {unitText}";
        string conversion = same.Name is not null ? "" : " (converted with the model cell's membrane area)";
        return (new ReadoutMatch(j + 1, header, target.Name, unitText, target.Unit, byUser, $"{rule} -> {target.Name} ({target.Unit}){conversion}."), values);
    }

    private static bool IsNumeric(RecordedFeatureTable table, int j) =>
        table.Rows.All(row => CellMetadataReader.Missing.Contains(row[j].Trim())
            || double.TryParse(row[j], NumberStyles.Float, CultureInfo.InvariantCulture, out _));

    private static Dictionary<string, double> Parse(RecordedFeatureTable table, int j)
    {
        var values = new Dictionary<string, double>(StringComparer.Ordinal);
        for (int i = 0; i < table.Rows.Count; i++)
        {
            string text = table.Rows[i][j].Trim();
            if (CellMetadataReader.Missing.Contains(text)) continue;
            if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out double v) || !double.IsFinite(v))
                throw new ExpressionFormatException($"{table.Source}: line {table.Lines[i]}, column {j + 1}: '{text}' in '{table.Headers[j]}' is not a " +
                    "number (use a decimal point; leave a missing value empty).");
            values[table.CellIds[i]] = v;
        }
        return values;
    }

    private static Dictionary<int, string> ResolveOverrides(RecordedFeatureTable table, IReadOnlyDictionary<string, string> overrides)
    {
        var result = new Dictionary<int, string>();
        foreach (var (column, readout) in overrides)
        {
            int j = -1;
            for (int k = 0; k < table.Headers.Count && j < 0; k++)
                if (table.Headers[k] == column) j = k;
            for (int k = 0; k < table.Headers.Count && j < 0; k++)
                if (ColumnHeader.Split(table.Headers[k]).Name == column) j = k;
            if (j < 0 || j == table.CellIdColumnNumber - 1)
                throw new ArgumentException($"map {column}={readout}: {table.Source} has no such value column (columns: {string.Join(", ", table.Headers)}).");
            string target = readout.Trim();
            if (!target.Equals("none", StringComparison.OrdinalIgnoreCase) && Readouts.All(r => r.Name != target))
                throw new ArgumentException($"map {column}={readout}: no read-out '{target}' (read-outs: {string.Join(", ", Readouts.Select(r => r.Name))}).");
            result[j] = target.Equals("none", StringComparison.OrdinalIgnoreCase) ? "none" : target;
        }
        return result;
    }
}
