using System.Text.RegularExpressions;

namespace ExprModel.Core.Tests.Export;

/// <summary>
/// Spreadsheet formula-injection probes and a check that a CSV text holds no live formula. The probes are the
/// usual formula starters (= + - @, tab, CR; common practice in formula-injection testing) plus a name that breaks out
/// of its cell at a comma and one that breaks out at a semicolon (semicolon-locale spreadsheets). Shared by the Core,
/// Web and CLI tests (linked into those projects), so every export meets the same probes.
/// </summary>
public static partial class FormulaProbes
{
    public static readonly string[] All =
    [
        "=1+1",
        "+1+1",
        "-1+1",
        "@SUM(1,2)",
        "\t=1+1",
        "\r=1+1",
        "x,=HYPERLINK(\"http://example.invalid\",\"open\")",
        "a;=1+1",
        "b\t=1+1",
        "c, \"=1+1\"",
    ];

    /// <summary>
    /// Fails when a spreadsheet opening <paramref name="csv"/> with ',' ';' or tab as separator would see a cell starting
    /// with = + - or @ that is not a plain number. Quoted fields are read as spreadsheets read them (RFC 4180), across
    /// line breaks; comment lines are checked like any other line, since a spreadsheet does not know they are comments.
    /// </summary>
    public static void AssertInert(string csv, string what)
    {
        foreach (var sep in new[] { ',', ';', '\t' })
        {
            foreach (var (line, field) in Cells(csv, sep))
            {
                if (field.Length == 0 || field[0] is not ('=' or '+' or '-' or '@')) continue;
                if (PlainNumber().IsMatch(field)) continue;
                // Split at ';' or tab, a comma row starting with a number ("-65.2,3") is that number followed by cells the
                // ',' pass checks; a spreadsheet reads it as text, not a formula.
                if (sep != ',' && PlainNumber().IsMatch(field.Split(',')[0])) continue;
                Assert.Fail($"{what}: line {line}, separator '{(sep == '\t' ? "tab" : sep.ToString())}': live formula cell '{field}'.\n{csv}");
            }
        }
    }

    private static IEnumerable<(int Line, string Field)> Cells(string csv, char sep)
    {
        var sb = new System.Text.StringBuilder();
        bool quoted = false, atStart = true;
        int line = 1, fieldLine = 1;
        for (int i = 0; i < csv.Length; i++)
        {
            var c = csv[i];
            if (quoted)
            {
                if (c == '"' && i + 1 < csv.Length && csv[i + 1] == '"') { sb.Append('"'); i++; }
                else if (c == '"') quoted = false;
                else { sb.Append(c); if (c == '\n') line++; }
                continue;
            }
            if (c == '"' && atStart) { quoted = true; atStart = false; continue; }
            if (c == sep || c == '\n' || (c == '\r' && i + 1 < csv.Length && csv[i + 1] == '\n'))
            {
                yield return (fieldLine, sb.ToString());
                sb.Clear();
                atStart = true;
                if (c == '\r') i++;
                if (c != sep) line++;
                fieldLine = line;
                continue;
            }
            sb.Append(c);
            atStart = false;
        }
        if (sb.Length > 0) yield return (fieldLine, sb.ToString());
    }

    [GeneratedRegex(@"^-?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$")]
    private static partial Regex PlainNumber();
}
