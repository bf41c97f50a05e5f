using System.Text;
using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Models;

namespace ExprModel.Core.Tests.Export;

/// <summary>
/// The BibTeX file of a model's sources, read back by a small parser written here from the BibTeX record syntax
/// (@type{key, name = {value}, ...}; braces balance; LaTeX's special characters # $ % &amp; _ ~ ^ appear only escaped).
/// </summary>
public sealed class BibTexTests
{
    private static readonly MethodsVersions Versions = new("9.9.9", "schema 1, sources abc");

    [Theory]
    [InlineData("hh1952")]
    [InlineData("wb1996")]
    [InlineData("cortex-rs2008")]
    [InlineData("cortex-fs2008")]
    public void Every_source_of_a_preset_is_one_parsable_record_with_a_unique_key(string preset)
    {
        var doc = TestCatalog.Catalog.Preset(preset);
        var model = TestCatalog.Catalog.BuildCell(doc);
        var (entries, keyByEntry) = BibTex.For(model, doc.Citation, Versions);
        var parsed = Parse(BibTex.Write(entries, ResearchCaution.Text));
        Assert.Equal(parsed.Count, parsed.Select(p => p.Key).Distinct(StringComparer.OrdinalIgnoreCase).Count());
        foreach (var ch in model.Channels)
        {
            var record = parsed.Single(p => p.Key == keyByEntry[ch.Entry.Key]);
            Assert.Equal(ch.Entry.Source.Year.ToString(System.Globalization.CultureInfo.InvariantCulture), record.Fields["year"]);
            Assert.Equal(ch.Entry.Source.Title, Unescape(record.Fields["title"]));
            Assert.Contains(ch.Entry.Key, record.Fields["note"]);
        }
        Assert.Contains(parsed, p => p.Fields.TryGetValue("version", out var v) && v == "9.9.9");
    }

    [Fact]
    public void Special_characters_are_escaped_suffixes_kept_and_clashing_keys_made_unique()
    {
        var baseModel = TestCatalog.Catalog.BuildCell(TestCatalog.Catalog.Preset("cortex-rs2008"));
        var first = baseModel.Channels[0];
        string title = "Na_v & K_v: 50% of #1 {braced} ~tilde^ back\\slash $x$";
        var source = first.Entry.Source with { Authors = "Butera RJ Jr, Rinzel J", Year = 1999, Title = title };
        var a = first with { Entry = first.Entry with { Id = "x-a", Source = source } };
        var b = first with { Entry = first.Entry with { Id = "x-b", Source = a.Entry.Source with { Title = "Another paper" } } };
        var model = baseModel with { Channels = [a, b] };
        var (entries, keys) = BibTex.For(model, "", Versions);
        var parsed = Parse(BibTex.Write(entries, ResearchCaution.Text));
        Assert.Equal("Butera1999", keys["x-a@1"]);
        Assert.Equal("Butera1999a", keys["x-b@1"]);
        var rec = parsed.Single(p => p.Key == "Butera1999");
        Assert.Equal(title, Unescape(rec.Fields["title"]));
        Assert.Equal("Butera, Jr, R. J. and Rinzel, J.", rec.Fields["author"]);
    }

    [Fact]
    public void The_parser_itself_refuses_an_unescaped_ampersand_and_unbalanced_braces()
    {
        Assert.Throws<FormatException>(() => Parse("@article{k,\n title = {A & B}\n}"));
        Assert.Throws<FormatException>(() => Parse("@article{k,\n title = {A {B}\n"));
        Assert.Single(Parse("@article{k,\n title = {A \\& B}\n}"));
    }

    internal sealed record Record(string Type, string Key, Dictionary<string, string> Fields);

    /// <summary>Reads every @type{key, field = {value}, ...} record; throws FormatException on a syntax error or an unescaped special character.</summary>
    internal static List<Record> Parse(string text)
    {
        var records = new List<Record>();
        int i = 0;
        while ((i = text.IndexOf('@', i)) >= 0)
        {
            int open = text.IndexOf('{', i);
            if (open < 0) throw new FormatException("record without '{'");
            string type = text[(i + 1)..open];
            if (type.Length == 0 || !type.All(char.IsAsciiLetterLower)) throw new FormatException($"bad type '{type}'");
            int comma = text.IndexOf(',', open);
            string key = text[(open + 1)..comma].Trim();
            if (key.Length == 0 || !key.All(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '_' or ':')) throw new FormatException($"bad key '{key}'");
            i = comma + 1;
            var fields = new Dictionary<string, string>(StringComparer.Ordinal);
            while (true)
            {
                while (i < text.Length && char.IsWhiteSpace(text[i])) i++;
                if (i >= text.Length) throw new FormatException($"record {key}: no closing brace");
                if (text[i] == '}') { i++; break; }
                int eq = text.IndexOf('=', i);
                string name = text[i..eq].Trim();
                if (name.Length == 0 || !name.All(char.IsAsciiLetterLower)) throw new FormatException($"bad field name '{name}'");
                i = eq + 1;
                while (char.IsWhiteSpace(text[i])) i++;
                if (text[i] != '{') throw new FormatException($"field {name}: value must be braced");
                i++;
                int depth = 1;
                var value = new StringBuilder();
                for (; ; i++)
                {
                    if (i >= text.Length) throw new FormatException($"field {name}: unbalanced braces");
                    char c = text[i];
                    if (c == '\\')
                    {
                        value.Append(c);
                        if (i + 1 < text.Length) value.Append(text[i + 1]);
                        i++;
                        continue;
                    }
                    if (c == '{') depth++;
                    else if (c == '}' && --depth == 0) break;
                    else if (c is '&' or '%' or '#' or '_' or '$' or '~' or '^') throw new FormatException($"field {name}: unescaped '{c}'");
                    value.Append(c);
                }
                if (!fields.TryAdd(name, value.ToString())) throw new FormatException($"field {name} twice");
                i++;
                while (i < text.Length && char.IsWhiteSpace(text[i])) i++;
                if (i < text.Length && text[i] == ',') i++;
            }
            records.Add(new Record(type, key, fields));
        }
        return records;
    }

    /// <summary>Undoes the LaTeX escapes (the inverse of what a reader of the file sees printed).</summary>
    internal static string Unescape(string value) => value
        .Replace(@"\textbackslash{}", "\\").Replace(@"\textasciitilde{}", "~").Replace(@"\textasciicircum{}", "^")
        .Replace(@"\{", "{").Replace(@"\}", "}").Replace(@"\#", "#").Replace(@"\$", "$").Replace(@"\%", "%").Replace(@"\&", "&").Replace(@"\_", "_");
}
