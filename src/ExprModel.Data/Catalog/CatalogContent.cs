using System.Globalization;
using System.Text.Json;
using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Core.Stochastic;

namespace ExprModel.Data.Catalog;

/// <summary>The parsed, cross-checked content of the catalog's source files.</summary>
public sealed class CatalogContent
{
    public required IReadOnlyList<ChannelEntry> Entries { get; init; }
    public required IReadOnlyList<string> EntryFiles { get; init; }
    public required IReadOnlyList<GeneLink> GeneLinks { get; init; }
    public required IReadOnlyList<GeneStatus> GeneStatuses { get; init; }
    public required IReadOnlyList<GeneIdentifier> GeneIdentifiers { get; init; }
    public required IReadOnlyDictionary<string, ModelDocument> Presets { get; init; }
    /// <summary>Provenance of the identifier table (source package, dates), from genes/identifiers.provenance.json.</summary>
    public required IReadOnlyDictionary<string, string> Provenance { get; init; }
    /// <summary>Unitary conductances per entry or family default, from unitary-conductances.csv.</summary>
    public required UnitaryConductances UnitaryConductances { get; init; }

    public static CatalogContent Parse(CatalogSources sources)
    {
        var entries = new List<ChannelEntry>();
        var files = new List<string>();
        var seen = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var (name, text) in sources.Under("entries"))
        {
            var e = EntryFile.Parse(text, "catalog/" + name);
            string expected = $"entries/{e.Id}.v{e.Version}.json";
            if (name != expected) throw new CatalogException($"catalog/{name}: file name must be {expected} for entry {e.Id} version {e.Version}.");
            if (seen.TryGetValue(e.Key, out var other)) throw new CatalogException($"catalog/{name}: entry {e.Key} is also defined in {other}.");
            seen[e.Key] = name;
            entries.Add(e);
            files.Add(name);
        }
        var ids = entries.Select(e => e.Id).ToHashSet(StringComparer.Ordinal);

        var links = new List<GeneLink>();
        foreach (var (name, text) in sources.Under("genes").Where(f => f.Key == "genes/links.csv"))
            foreach (var (line, cols) in Csv(text, name, ["species", "symbol", "entry", "weight", "role", "reason"]))
            {
                if (!ids.Contains(cols[2])) throw new CatalogException($"catalog/{name}: line {line}, column entry: unknown entry '{cols[2]}'.");
                if (!double.TryParse(cols[3], NumberStyles.Float, CultureInfo.InvariantCulture, out var w) || !(w > 0))
                    throw new CatalogException($"catalog/{name}: line {line}, column weight: '{cols[3]}' is not a positive number.");
                if (cols[4] is not ("pore" or GeneLink.ProxyRole))
                    throw new CatalogException($"catalog/{name}: line {line}, column role: '{cols[4]}' is not pore or proxy.");
                if (cols[4] == GeneLink.ProxyRole && cols[5].Length == 0)
                    throw new CatalogException($"catalog/{name}: line {line}, column reason: a proxy link of {cols[1]} to {cols[2]} needs a reason.");
                links.Add(new GeneLink(ParseSpecies(cols[0], name, line), cols[1], cols[2], w, cols[4], cols[5]));
            }
        var statuses = new List<GeneStatus>();
        foreach (var (name, text) in sources.Under("genes").Where(f => f.Key == "genes/status.csv"))
            foreach (var (line, cols) in Csv(text, name, ["species", "symbol", "status", "reason"]))
            {
                if (cols[2] is not ("linked" or "auxiliary" or "non-neuronal" or "not-modelled"))
                    throw new CatalogException($"catalog/{name}: line {line}, column status: '{cols[2]}' is not linked, auxiliary, " +
                        "non-neuronal or not-modelled.");
                statuses.Add(new GeneStatus(ParseSpecies(cols[0], name, line), cols[1], cols[2], cols[3]));
            }
        var identifiers = new List<GeneIdentifier>();
        foreach (var (name, text) in sources.Under("genes").Where(f => f.Key == "genes/identifiers.csv"))
            foreach (var (line, cols) in Csv(text, name, ["identifier", "kind", "symbol", "species"]))
                identifiers.Add(new GeneIdentifier(cols[0], cols[1], cols[2], ParseSpecies(cols[3], name, line)));
        var provenance = new Dictionary<string, string>(StringComparer.Ordinal);
        if (sources.Files.TryGetValue("genes/identifiers.provenance.json", out var prov))
        {
            const string provenanceFile = "catalog/genes/identifiers.provenance.json";
            JsonDocument doc;
            try { doc = JsonDocument.Parse(prov); }
            catch (JsonException e) { throw new CatalogException(JsonErrorMessage.For(e, provenanceFile)); }
            using (doc)
            {
                if (doc.RootElement.ValueKind != JsonValueKind.Object)
                    throw new CatalogException($"{provenanceFile}: must be a JSON object of names to values.");
                foreach (var p in doc.RootElement.EnumerateObject()) provenance[p.Name] = p.Value.ToString();
            }
        }

        var presets = new Dictionary<string, ModelDocument>(StringComparer.Ordinal);
        var latest = entries.GroupBy(e => e.Id).ToDictionary(g => g.Key, g => g.Max(e => e.Version));
        foreach (var (name, text) in sources.Under("models"))
        {
            var id = Path.GetFileNameWithoutExtension(name);
            ModelDocument doc;
            try { doc = ModelDocument.Parse(text, "catalog/" + name); }
            catch (ModelFileException e) { throw new CatalogException(e.Message); }
            foreach (var c in doc.Channels)
            {
                if (!latest.TryGetValue(c.Entry, out var max)) throw new CatalogException($"catalog/{name}: channel entry '{c.Entry}' is not in the catalog.");
                if (c.Version is { } v && !seen.ContainsKey($"{c.Entry}@{v}"))
                    throw new CatalogException($"catalog/{name}: entry {c.Entry} has no version {v}.");
            }
            presets[id] = doc;
        }
        var unitary = ParseUnitary(sources, ids, entries.Select(e => e.Family).ToHashSet(StringComparer.Ordinal));
        return new CatalogContent
        {
            UnitaryConductances = unitary,
            Entries = entries,
            EntryFiles = files,
            GeneLinks = links,
            GeneStatuses = statuses,
            GeneIdentifiers = identifiers,
            Presets = presets,
            Provenance = provenance,
        };
    }

    internal const string UnitaryFile = "unitary-conductances.csv";

    /// <summary>Reads the unitary-conductance table: entry ids must exist, families be known, values positive pS.</summary>
    private static UnitaryConductances ParseUnitary(CatalogSources sources, HashSet<string> ids, HashSet<string> families)
    {
        if (!sources.Files.TryGetValue(UnitaryFile, out var text))
            throw new CatalogException($"catalog/{UnitaryFile}: missing (every entry needs a unitary conductance or a family default).");
        var rows = new List<UnitaryConductance>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        foreach (var (line, cols) in Csv(text, UnitaryFile, ["key", "conductance_ps", "basis", "citation", "note"]))
        {
            string key = cols[0];
            bool family = key.StartsWith("family:", StringComparison.Ordinal);
            if (family ? key != UnitaryConductances.LastResortKey && !families.Contains(key["family:".Length..]) : !ids.Contains(key))
                throw new CatalogException($"catalog/{UnitaryFile}: line {line}, column key: unknown {(family ? "family" : "entry")} '{key}'.");
            if (!seen.Add(key)) throw new CatalogException($"catalog/{UnitaryFile}: line {line}, column key: '{key}' appears twice.");
            if (!double.TryParse(cols[1], NumberStyles.Float, CultureInfo.InvariantCulture, out var ps) || !(ps > 0) || ps > 1000)
                throw new CatalogException($"catalog/{UnitaryFile}: line {line}, column conductance_ps: '{cols[1]}' is not a number of pS in (0, 1000].");
            if (cols[2] != (family ? "family-default" : "entry"))
                throw new CatalogException(
                    $"catalog/{UnitaryFile}: line {line}, column basis: must be '{(family ? "family-default" : "entry")}' for key '{key}'.");
            if (cols[3].Length == 0)
                throw new CatalogException($"catalog/{UnitaryFile}: line {line}, column citation: empty (name the source or 'common practice').");
            rows.Add(new UnitaryConductance(key, ps, family, cols[3], cols[4]));
        }
        if (!seen.Contains(UnitaryConductances.LastResortKey))
            throw new CatalogException($"catalog/{UnitaryFile}: needs a '{UnitaryConductances.LastResortKey}' row (the default of last resort).");
        return new UnitaryConductances(rows);
    }

    internal static Species ParseSpecies(string s, string file, int line) => s.ToLowerInvariant() switch
    {
        "human" => Species.Human,
        "mouse" => Species.Mouse,
        "rat" => Species.Rat,
        _ => throw new CatalogException($"catalog/{file}: line {line}, column species: '{s}' is not human, mouse or rat."),
    };

    /// <summary>Minimal reader for the catalog's own simple CSV files (no quoting; commas not allowed in fields).</summary>
    private static IEnumerable<(int Line, string[] Cols)> Csv(string text, string file, string[] header)
    {
        var lines = text.Replace("\r\n", "\n").Split('\n');
        if (lines.Length == 0 || lines[0].Trim() != string.Join(',', header))
            throw new CatalogException($"catalog/{file}: line 1: header must be '{string.Join(',', header)}'.");
        for (int i = 1; i < lines.Length; i++)
        {
            var l = lines[i];
            if (l.Length == 0 || l.StartsWith('#')) continue;
            var cols = l.Split(',');
            if (cols.Length != header.Length)
                throw new CatalogException($"catalog/{file}: line {i + 1}: expected {header.Length} fields ({string.Join(',', header)}), found {cols.Length}.");
            yield return (i + 1, cols.Select(c => c.Trim()).ToArray());
        }
    }
}
