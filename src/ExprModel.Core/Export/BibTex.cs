using System.Globalization;
using System.Text;
using ExprModel.Core.Cell;
using ExprModel.Core.Kinetics;

namespace ExprModel.Core.Export;

/// <summary>
/// The BibTeX file of every source a model cites: one record per distinct paper behind its channels (shared papers once,
/// with every entry that uses them in the note), the whole model's own citation when it has one, and the program. Keys are
/// first author's surname + year (ASCII letters), made unique with a, b, ...; values are escaped for LaTeX's special
/// characters (# $ % &amp; _ { } ~ ^ \) and page ranges take an en dash (--), as BibTeX expects.
/// </summary>
public static class BibTex
{
    /// <summary>The records for a model, and for each channel entry key (id@version) the record key it cites.</summary>
    public static (IReadOnlyList<BibEntry> Entries, IReadOnlyDictionary<string, string> KeyByEntry) For(CellModel model, string modelCitation,
        MethodsVersions versions)
    {
        var entries = new List<BibEntry>();
        var keyByEntry = new Dictionary<string, string>(StringComparer.Ordinal);
        var keyBySource = new Dictionary<string, string>(StringComparer.Ordinal);
        var usedBy = new Dictionary<string, List<string>>(StringComparer.Ordinal);
        var taken = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        var order = new List<(string SourceId, Citation C)>();
        foreach (var ch in model.Channels)
        {
            var c = ch.Entry.Source;
            string id = $"{c.Authors}|{c.Year}|{c.Title}|{c.Journal}";
            if (!keyBySource.TryGetValue(id, out var key))
            {
                key = UniqueKey(FirstSurname(c.Authors) + c.Year.ToString(CultureInfo.InvariantCulture), taken);
                keyBySource[id] = key;
                usedBy[key] = [];
                order.Add((id, c));
            }
            keyByEntry[ch.Entry.Key] = key;
            if (!usedBy[key].Contains(ch.Entry.Key)) usedBy[key].Add(ch.Entry.Key);
        }
        foreach (var (id, c) in order)
        {
            string key = keyBySource[id];
            bool chapter = c.Volume.Length == 0;
            var f = new List<KeyValuePair<string, string>>
            {
                new("author", Authors(c.Authors)),
                new("title", c.Title),
                new(chapter ? "booktitle" : "journal", c.Journal),
                new("year", c.Year.ToString(CultureInfo.InvariantCulture)),
            };
            if (c.Volume.Length > 0) f.Add(new("volume", c.Volume));
            if (c.Pages.Length > 0) f.Add(new("pages", c.Pages.Replace("-", "--", StringComparison.Ordinal)));
            if (c.Doi.Length > 0) f.Add(new("doi", c.Doi));
            string where = c.Location.Length > 0 ? $"; parameters from {c.Location}" : "";
            f.Add(new("note", $"ExprModel catalog entries {string.Join(", ", usedBy[key])}{where}; citation {Word(c.Verification)}"));
            entries.Add(new BibEntry(chapter ? "incollection" : "article", key, f));
        }
        if (!string.IsNullOrWhiteSpace(modelCitation))
            entries.Add(new BibEntry("misc", UniqueKey("model", taken),
                [new("title", model.Name), new("note", modelCitation)]));
        entries.Add(new BibEntry("misc", UniqueKey("exprmodel", taken),
            [new("title", "ExprModel: conductance-based single-compartment models from ion-channel gene expression"),
                new("version", versions.Software), new("note", "channel catalog " + versions.Catalog)]));
        return (entries, keyByEntry);
    }

    /// <summary>The file text: one record per entry, fields one per line, values in braces.</summary>
    public static string Write(IEnumerable<BibEntry> entries, string caution)
    {
        var sb = new StringBuilder();
        sb.Append("% ").Append(caution).Append('\n');
        foreach (var e in entries)
        {
            sb.Append('\n').Append('@').Append(e.Type).Append('{').Append(e.Key).Append(",\n");
            for (int i = 0; i < e.Fields.Count; i++)
            {
                var (name, value) = (e.Fields[i].Key, e.Fields[i].Value);
                sb.Append("  ").Append(name).Append(" = {").Append(name == "doi" ? EscapeDoi(value) : Escape(value)).Append('}');
                sb.Append(i + 1 < e.Fields.Count ? ",\n" : "\n");
            }
            sb.Append("}\n");
        }
        return sb.ToString();
    }

    /// <summary>Escapes LaTeX's special characters so a value is taken literally.</summary>
    public static string Escape(string value)
    {
        var sb = new StringBuilder(value.Length + 8);
        foreach (char ch in value)
        {
            sb.Append(ch switch
            {
                '\\' => @"\textbackslash{}",
                '{' => @"\{",
                '}' => @"\}",
                '#' => @"\#",
                '$' => @"\$",
                '%' => @"\%",
                '&' => @"\&",
                '_' => @"\_",
                '~' => @"\textasciitilde{}",
                '^' => @"\textasciicircum{}",
                '\n' or '\r' => " ",
                _ => ch.ToString(),
            });
        }
        return sb.ToString();
    }

    // A DOI keeps its characters (link packages read it verbatim); only braces and the comment character would break the file.
    private static string EscapeDoi(string doi) => doi.Replace("{", "", StringComparison.Ordinal).Replace("}", "", StringComparison.Ordinal)
        .Replace("%", @"\%", StringComparison.Ordinal);

    /// <summary>"Hodgkin AL, Huxley AF" -> "Hodgkin, A. L. and Huxley, A. F."; "Butera RJ Jr" -> "Butera, Jr, R. J."; "et al." -> "others".</summary>
    public static string Authors(string catalogAuthors)
    {
        var people = new List<string>();
        foreach (var raw in catalogAuthors.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            if (raw.StartsWith("et al", StringComparison.OrdinalIgnoreCase)) { people.Add("others"); continue; }
            var parts = raw.Split(' ', StringSplitOptions.RemoveEmptyEntries).ToList();
            string? suffix = null;
            if (parts.Count > 2 && IsSuffix(parts[^1])) { suffix = parts[^1]; parts.RemoveAt(parts.Count - 1); }
            if (parts.Count >= 2 && IsInitials(parts[^1]))
            {
                string initials = string.Join(" ", parts[^1].Select(ch => ch + "."));
                string surname = string.Join(" ", parts.Take(parts.Count - 1));
                people.Add(suffix is null ? $"{surname}, {initials}" : $"{surname}, {suffix}, {initials}");
            }
            else people.Add("{" + raw + "}");
        }
        return string.Join(" and ", people);
    }

    private static bool IsSuffix(string token) => token.TrimEnd('.') is "Jr" or "Sr" or "II" or "III";

    private static bool IsInitials(string token) => token.Length <= 4 && token.All(char.IsUpper);

    private static string FirstSurname(string authors)
    {
        var first = authors.Split(',')[0].Trim().Split(' ', StringSplitOptions.RemoveEmptyEntries).ToList();
        if (first.Count > 2 && IsSuffix(first[^1])) first.RemoveAt(first.Count - 1);
        if (first.Count >= 2 && IsInitials(first[^1])) first.RemoveAt(first.Count - 1);
        var surname = string.Join("", first);
        var key = Ascii(surname);
        return key.Length > 0 ? key : "source";
    }

    private static string Ascii(string s)
    {
        var folded = s.Normalize(NormalizationForm.FormD);
        return new string(folded.Where(ch => ch is (>= 'A' and <= 'Z') or (>= 'a' and <= 'z') or (>= '0' and <= '9') or ' ').ToArray());
    }

    private static string UniqueKey(string stem, HashSet<string> taken)
    {
        if (taken.Add(stem)) return stem;
        for (char c = 'a'; ; c++)
        {
            string k = c <= 'z' ? stem + c : stem + taken.Count.ToString(CultureInfo.InvariantCulture);
            if (taken.Add(k)) return k;
        }
    }

    private static string Word(Verification v) => v == Verification.Checked ? "checked against the paper" : "recalled, not checked against the paper";
}
