using System.Globalization;
using System.Text;
using ExprModel.Core.Models;

namespace ExprModel.Core.Export;

/// <summary>
/// The one CSV writer: RFC 4180 quoting, invariant numbers, '#' comment lines (the research caution goes there),
/// and spreadsheet-formula neutralisation (a text cell starting with = + - @ tab or CR is prefixed with a quote,
/// common practice against formula injection). Numbers are written as numbers and never neutralised.
/// </summary>
public sealed class CsvTable
{
    private readonly StringBuilder _sb = new();
    private readonly int _columns;

    public CsvTable(IEnumerable<string> comments, IReadOnlyList<string> header)
    {
        foreach (var c in comments) _sb.Append("# ").Append(c.Replace('\n', ' ').Replace('\r', ' ')).Append('\n');
        _columns = header.Count;
        Row(header.Select(h => (object?)h).ToArray());
    }

    /// <summary>A table about one model: its first comment lines are the research-use caution and the model's name.</summary>
    public static CsvTable ForModel(string modelName, IReadOnlyList<string> header, params string[] moreComments) =>
        new([ResearchCaution.Text, "model: " + modelName, .. moreComments], header);

    public CsvTable Row(params object?[] cells)
    {
        if (cells.Length != _columns) throw new ArgumentException($"Row has {cells.Length} cells; header has {_columns}.");
        for (int i = 0; i < cells.Length; i++)
        {
            if (i > 0) _sb.Append(',');
            _sb.Append(Cell(cells[i]));
        }
        _sb.Append('\n');
        return this;
    }

    public static string Cell(object? value) => value switch
    {
        null => "",
        double d when double.IsNaN(d) => "",
        double d => d.ToString("R", CultureInfo.InvariantCulture),
        float f => f.ToString("R", CultureInfo.InvariantCulture),
        int or long => Convert.ToString(value, CultureInfo.InvariantCulture)!,
        bool b => b ? "1" : "0",
        _ => Text(Convert.ToString(value, CultureInfo.InvariantCulture) ?? ""),
    };

    private static string Text(string s)
    {
        if (s.Length > 0 && s[0] is '=' or '+' or '-' or '@' or '\t' or '\r') s = "'" + s;
        return s.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
    }

    public override string ToString() => _sb.ToString();
}
