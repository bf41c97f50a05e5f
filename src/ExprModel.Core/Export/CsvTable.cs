using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;
using ExprModel.Core.Models;

namespace ExprModel.Core.Export;

/// <summary>
/// The one CSV writer: RFC 4180 quoting, invariant numbers, '#' comment lines (the research caution goes there),
/// and spreadsheet-formula neutralisation on every line (OWASP's CSV-injection guidance, common practice): a text cell
/// starting with = + - @ tab or CR is prefixed with a quote unless it is a plain number ("-90", "-1.5e3": data a
/// spreadsheet reads as a number, as it reads the numeric cells); a cell holding ',' ';' tab, a quote or a line break is
/// quoted; and wherever a spreadsheet would start a cell inside the text, the piece gets a quote before a leading
/// = + - or @. Inside a text cell that is after ';' or tab (a semicolon- or tab-locale spreadsheet splits the same line
/// elsewhere); a comma there never starts a cell, since a cell holding one is quoted and every spreadsheet keeps a quoted
/// cell whole at its commas, so a note such as "(sweep 1, -90 pA)" is written as it is. A comment line is not quoted, so
/// there a comma starts a cell too. Numbers are written as numbers. Anything that writes CSV text goes through here.
/// </summary>
/// <remarks>
/// A whole cell that starts with '-' and is not a plain number ("-90 pA") keeps its quote: spreadsheets read such a cell
/// as a formula (an error at best, and a formula payload can start with '-'), and OWASP lists '-' among the characters to
/// neutralise. The cost is one visible quote on a cell that is text anyway.
/// </remarks>
public sealed partial class CsvTable
{
    private readonly StringBuilder _sb = new();
    private readonly int _columns;

    public CsvTable(IEnumerable<string> comments, IReadOnlyList<string> header)
    {
        foreach (var c in comments) _sb.Append(Comment(c)).Append('\n');
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

    /// <summary>
    /// A '#' comment line (without its line break): line breaks become spaces, and wherever a spreadsheet splitting the
    /// line at ',' ';' or tab would start a cell (after optional blanks and quotes) with = + - or @, a quote is put first.
    /// </summary>
    public static string Comment(string text) => "# " + Pieces(text.Replace('\n', ' ').Replace('\r', ' '), commaStartsCell: true);

    /// <summary>
    /// Puts a quote before = + - or @ wherever a spreadsheet splitting the text at ';' or tab (and at ',' when
    /// <paramref name="commaStartsCell"/>: a line that is not quoted) would start a cell with it (after optional blanks
    /// and quotes): quoting a cell protects it from the comma split only, not from a semicolon- or tab-locale spreadsheet
    /// that splits the same line elsewhere.
    /// </summary>
    private static string Pieces(string text, bool commaStartsCell)
    {
        var sb = new StringBuilder(text.Length + 4);
        bool cellStart = false;
        foreach (var c in text)
        {
            if (cellStart && IsFormulaStart(c)) sb.Append('\'');
            sb.Append(c);
            if (c is ';' or '\t' || (c == ',' && commaStartsCell)) cellStart = true;
            else if (c is not (' ' or '"')) cellStart = false;
        }
        return sb.ToString();
    }

    /// <summary>
    /// Re-writes one data line of a CSV file this writer produced elsewhere (a batch shard) through the same rules:
    /// plain numbers stay as they are, every other field is neutralised and quoted as a text cell would be.
    /// </summary>
    public static string Line(string line) => string.Join(',', Fields(line).Select(f => PlainNumber().IsMatch(f) ? f : Text(f)));

    /// <summary>The fields of one RFC 4180 line (quotes removed, doubled quotes undone).</summary>
    public static IReadOnlyList<string> Fields(string line)
    {
        var fields = new List<string>();
        var sb = new StringBuilder();
        bool quoted = false;
        for (int i = 0; i < line.Length; i++)
        {
            var c = line[i];
            if (quoted)
            {
                if (c != '"') sb.Append(c);
                else if (i + 1 < line.Length && line[i + 1] == '"') { sb.Append('"'); i++; }
                else quoted = false;
            }
            else if (c == '"') quoted = true;
            else if (c == ',') { fields.Add(sb.ToString()); sb.Clear(); }
            else sb.Append(c);
        }
        fields.Add(sb.ToString());
        return fields;
    }

    private static bool IsFormulaStart(char c) => c is '=' or '+' or '-' or '@';

    private static string Text(string s)
    {
        if (s.Length > 0 && (IsFormulaStart(s[0]) || s[0] is '\t' or '\r') && !PlainNumber().IsMatch(s)) s = "'" + s;
        s = Pieces(s, commaStartsCell: false);
        return s.IndexOfAny([',', ';', '\t', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
    }

    [GeneratedRegex(@"^-?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$")]
    private static partial Regex PlainNumber();

    public override string ToString() => _sb.ToString();
}
