using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using ExprModel.Core.Stochastic;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Catalog;

/// <summary>
/// The catalog as loaded from its SQLite database: every version of every entry, gene links and statuses,
/// identifiers and preset models. Immutable and shared; entries are rebuilt from the database's tables.
/// </summary>
public sealed class ChannelCatalog
{
    private readonly Dictionary<string, ChannelEntry> _byKey;
    private readonly Dictionary<string, ChannelEntry> _latest;

    public IReadOnlyList<ChannelEntry> AllVersions { get; }
    public IReadOnlyList<ChannelEntry> Latest { get; }
    public IReadOnlyList<GeneLink> GeneLinks { get; }
    public IReadOnlyList<GeneStatus> GeneStatuses { get; }
    public IReadOnlyList<GeneIdentifier> GeneIdentifiers { get; }
    public IReadOnlyDictionary<string, ModelDocument> Presets { get; }
    public IReadOnlyDictionary<string, string> Meta { get; }
    public string DatabasePath { get; }
    /// <summary>Unitary conductance of each entry (its own cited value or its family's labelled default).</summary>
    public UnitaryConductances UnitaryConductances { get; }

    /// <summary>How a methods paragraph names this catalog: its schema version and the first 12 hex digits of its sources' hash.</summary>
    public string VersionLabel
    {
        get
        {
            string hash = Meta.GetValueOrDefault("source_hash", "?");
            return $"schema {Meta.GetValueOrDefault("schema_version", "?")}, sources {hash[..Math.Min(12, hash.Length)]}";
        }
    }

    private ChannelCatalog(string path, List<ChannelEntry> entries, List<GeneLink> links, List<GeneStatus> statuses,
        List<GeneIdentifier> ids, Dictionary<string, ModelDocument> presets, Dictionary<string, string> meta, UnitaryConductances unitary)
    {
        UnitaryConductances = unitary;
        DatabasePath = path;
        AllVersions = entries;
        _byKey = entries.ToDictionary(e => e.Key, StringComparer.Ordinal);
        _latest = entries.GroupBy(e => e.Id, StringComparer.Ordinal).ToDictionary(g => g.Key, g => g.MaxBy(e => e.Version)!, StringComparer.Ordinal);
        Latest = _latest.Values.OrderBy(e => e.Family, StringComparer.Ordinal).ThenBy(e => e.Id, StringComparer.Ordinal).ToArray();
        GeneLinks = links;
        GeneStatuses = statuses;
        GeneIdentifiers = ids;
        Presets = presets;
        Meta = meta;
    }

    /// <summary>The entry with this id at the pinned version, or the latest version when none is pinned.</summary>
    public ChannelEntry Resolve(string id, int? version)
    {
        if (version is { } v)
            return _byKey.TryGetValue($"{id}@{v}", out var e) ? e
                : _latest.ContainsKey(id) ? throw new CatalogException($"Catalog entry '{id}' has no version {v} (latest is {_latest[id].Version}).")
                : throw new CatalogException($"Unknown catalog entry '{id}'.");
        return _latest.TryGetValue(id, out var l) ? l
            : throw new CatalogException($"Unknown catalog entry '{id}'. Run 'exprmodel catalog list' to see the entries.");
    }

    public bool Contains(string id) => _latest.ContainsKey(id);

    /// <summary>What the expression mapping needs: latest entries, links, statuses, identifiers.</summary>
    public ExprModel.Core.Mapping.MappingCatalog ForMapping() => new(Latest, GeneLinks, GeneStatuses, GeneIdentifiers);

    /// <summary>Resolves a model file's entries (pinned versions, or latest) into a simulatable cell.</summary>
    public ExprModel.Core.Cell.CellModel BuildCell(ModelDocument doc) => doc.ToCellModel(Resolve);

    public ModelDocument Preset(string id) =>
        Presets.TryGetValue(id, out var p) ? p
            : throw new CatalogException($"Unknown preset '{id}'. Presets: {string.Join(", ", Presets.Keys.Order(StringComparer.Ordinal))}.");

    /// <summary>Loads the catalog database; an SQLite error is a <see cref="CatalogException"/> naming the file.</summary>
    public static ChannelCatalog Open(string databasePath)
    {
        try
        {
            return Load(databasePath);
        }
        catch (SqliteException e)
        {
            throw new CatalogException($"{databasePath}: the catalog database cannot be read: {e.Message}", e);
        }
    }

    private static ChannelCatalog Load(string databasePath)
    {
        if (!File.Exists(databasePath)) throw new CatalogException($"{databasePath}: catalog database not found; run 'exprmodel catalog build'.");
        using var conn =
            new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = databasePath, Mode = SqliteOpenMode.ReadOnly, Pooling = false }.ToString());
        conn.Open();
        var meta = Rows(conn, "SELECT key, value FROM meta").ToDictionary(r => r.GetString(0), r => r.GetString(1));
        var rates = new Dictionary<(string, long, long), Dictionary<string, GateRate>>();
        foreach (var r in Rows(conn, "SELECT entry_id, version, gate_ordinal, role, shape, a, v0, k, exponent, floor, base, v1, k1, c1, c2 FROM gate_rates"))
        {
            var key = (r.GetString(0), r.GetInt64(1), r.GetInt64(2));
            if (!rates.TryGetValue(key, out var d)) rates[key] = d = new();
            d[r.GetString(3)] = new GateRate
            {
                Shape = Enum.Parse<RateShape>(r.GetString(4).Replace("-", ""), ignoreCase: true),
                A = r.GetDouble(5),
                V0 = r.GetDouble(6),
                K = r.GetDouble(7),
                Exponent = r.GetDouble(8),
                Floor = r.GetDouble(9),
                Base = r.GetDouble(10),
                V1 = r.GetDouble(11),
                K1 = r.GetDouble(12),
                C1 = r.GetDouble(13),
                C2 = r.GetDouble(14),
            };
        }
        var gates = new Dictionary<(string, long), List<GateSpec>>();
        foreach (var r in Rows(conn, "SELECT entry_id, version, ordinal, name, power, kind, instantaneous, rate_factor, ca_half_mm, ca_hill, " +
            "ca_tau_ms, na_half_mm, na_hill, na_tau_ms FROM gates ORDER BY entry_id, version, ordinal"))
        {
            var key = (r.GetString(0), r.GetInt64(1));
            if (!gates.TryGetValue(key, out var list)) gates[key] = list = [];
            rates.TryGetValue((key.Item1, key.Item2, r.GetInt64(2)), out var rr);
            rr ??= new();
            list.Add(new GateSpec
            {
                Name = r.GetString(3),
                Power = r.GetInt32(4),
                Kind = Enum.Parse<GateKind>(r.GetString(5).Replace("-", ""), ignoreCase: true),
                Instantaneous = r.GetInt64(6) != 0,
                RateFactor = r.GetDouble(7),
                Calcium = r.IsDBNull(8) ? null : new CalciumSensitivity(r.GetDouble(8), r.GetDouble(9), r.GetDouble(10)),
                Sodium = r.IsDBNull(11) ? null : new SodiumSensitivity(r.GetDouble(11), r.GetDouble(12), r.GetDouble(13)),
                Alpha = rr.GetValueOrDefault("alpha"),
                Beta = rr.GetValueOrDefault("beta"),
                SteadyState = rr.GetValueOrDefault("steady"),
                TimeConstantMs = rr.GetValueOrDefault("tau"),
            });
        }
        var published = new Dictionary<(string, long), List<PublishedValue>>();
        foreach (var r in Rows(conn, "SELECT entry_id, version, quantity, gate, value, at_mv, tolerance, location FROM published_values"))
        {
            var key = (r.GetString(0), r.GetInt64(1));
            if (!published.TryGetValue(key, out var list)) published[key] = list = [];
            list.Add(new PublishedValue
            {
                Quantity = r.GetString(2),
                Gate = r.GetString(3),
                Value = r.GetDouble(4),
                AtMv = r.GetDouble(5),
                Tolerance = r.GetDouble(6),
                Where = r.GetString(7)
            });
        }
        var entries = new List<ChannelEntry>();
        foreach (var r in Rows(conn, """
            SELECT e.entry_id, e.version, e.name, e.family, e.ion, e.reversal_rule, e.reversal_mv, e.temperature_c, e.q10,
                   e.density_typical, e.density_min, e.density_max, e.preparation, e.curator_note,
                   s.authors, s.year, s.title, s.journal, s.volume, s.pages, s.doi, s.location, s.verification,
                   s.citation_check, s.citation_checked_at, s.citation_note, e.source_density_value, e.source_density_unit,
                   e.source_density_capacitance_pf, e.source_density_area_um2, e.source_density_specific_capacitance, e.source_density_where
            FROM entries e JOIN sources s ON s.source_id = e.source_id ORDER BY e.entry_id, e.version
            """))
        {
            var key = (r.GetString(0), r.GetInt64(1));
            entries.Add(new ChannelEntry
            {
                Id = key.Item1,
                Version = (int)key.Item2,
                Name = r.GetString(2),
                Family = r.GetString(3),
                Ion = ParseWord<Ion>(r.GetString(4)),
                Reversal = ParseWord<ReversalRule>(r.GetString(5)),
                ReversalMv = r.IsDBNull(6) ? null : r.GetDouble(6),
                ReferenceTemperatureC = r.GetDouble(7),
                Q10 = r.GetDouble(8),
                TypicalDensityMsPerCm2 = r.GetDouble(9),
                MinDensityMsPerCm2 = r.GetDouble(10),
                MaxDensityMsPerCm2 = r.GetDouble(11),
                Preparation = r.GetString(12),
                CuratorNote = r.GetString(13),
                Source = new Citation
                {
                    Authors = r.GetString(14),
                    Year = r.GetInt32(15),
                    Title = r.GetString(16),
                    Journal = r.GetString(17),
                    Volume = r.GetString(18),
                    Pages = r.GetString(19),
                    Doi = r.GetString(20),
                    Location = r.GetString(21),
                    Verification = ParseWord<Verification>(r.GetString(22)),
                    CitationCheck = ParseWord<CitationCheck>(r.GetString(23)),
                    CitationCheckedAt = r.GetString(24),
                    CitationNote = r.GetString(25),
                },
                SourceDensity = r.IsDBNull(26) ? null : new SourceDensity(r.GetDouble(26), r.GetString(27), r.IsDBNull(28) ? null : r.GetDouble(28),
                    r.IsDBNull(29) ? null : r.GetDouble(29), r.GetDouble(30), r.GetString(31)),
                Gates = gates.TryGetValue(key, out var gl) ? gl : [],
                PublishedValues = published.TryGetValue(key, out var pl) ? pl : [],
            });
        }
        var links = Rows(conn, "SELECT species, symbol, entry_id, weight, role, reason FROM gene_links ORDER BY species, symbol, entry_id")
            .Select(r => new GeneLink(ParseWord<Species>(r.GetString(0)), r.GetString(1), r.GetString(2), r.GetDouble(3), r.GetString(4), r.GetString(5)))
            .ToList();
        var statuses = Rows(conn, "SELECT species, symbol, status, reason FROM gene_status ORDER BY species, symbol")
            .Select(r => new GeneStatus(ParseWord<Species>(r.GetString(0)), r.GetString(1), r.GetString(2), r.GetString(3))).ToList();
        var ids = Rows(conn, "SELECT identifier, kind, symbol, species FROM gene_identifiers")
            .Select(r => new GeneIdentifier(r.GetString(0), r.GetString(1), r.GetString(2), ParseWord<Species>(r.GetString(3)))).ToList();
        var presets = Rows(conn, "SELECT preset_id, model_json FROM presets")
            .ToDictionary(r => r.GetString(0), r => ModelDocument.Parse(r.GetString(1), "preset " + r.GetString(0)), StringComparer.Ordinal);
        var unitary = new UnitaryConductances(Rows(conn, "SELECT key, conductance_ps, family_default, citation, note FROM unitary_conductances ORDER BY key")
            .Select(r => new UnitaryConductance(r.GetString(0), r.GetDouble(1), r.GetInt64(2) != 0, r.GetString(3), r.GetString(4))).ToList());
        return new ChannelCatalog(databasePath, entries, links, statuses, ids, presets, meta, unitary);
    }

    private static T ParseWord<T>(string s) where T : struct, Enum => Enum.Parse<T>(s.Replace("-", ""), ignoreCase: true);

    private static IEnumerable<SqliteDataReader> Rows(SqliteConnection conn, string sql)
    {
        using var cmd = conn.CreateCommand();
        cmd.CommandText = sql;
        using var r = cmd.ExecuteReader();
        while (r.Read()) yield return r;
    }
}
