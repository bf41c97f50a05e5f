using System.Globalization;
using ExprModel.Core.Expression.Identifiers;
using ExprModel.Core.Kinetics;
using ExprModel.Core.Mapping;
using ExprModel.Core.Models;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Catalog;

/// <summary>
/// Builds the catalog's SQLite database from its source files, deterministically, into a temporary file that
/// replaces the old database only when complete (so a failed build never leaves a half-written catalog).
/// Schema: see <see cref="Schema"/> and DEVELOPERS.md.
/// </summary>
public static class CatalogBuilder
{
    /// <summary>
    /// 2: citation check (sources), the paper's stated conductance (entries), link reason (gene_links). 3: unitary_conductances.
    /// 4: sodium-gated gates (na_half_mm, na_hill, na_tau_ms).
    /// </summary>
    public const int SchemaVersion = 4;

    public const string Schema = """
        CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
        CREATE TABLE sources (
            source_id INTEGER PRIMARY KEY, authors TEXT NOT NULL, year INTEGER NOT NULL, title TEXT NOT NULL,
            journal TEXT NOT NULL, volume TEXT NOT NULL, pages TEXT NOT NULL, doi TEXT NOT NULL,
            location TEXT NOT NULL, verification TEXT NOT NULL CHECK (verification IN ('recalled', 'checked')),
            citation_check TEXT NOT NULL CHECK (citation_check IN ('unchecked', 'confirmed', 'not-found')),
            citation_checked_at TEXT NOT NULL, citation_note TEXT NOT NULL);
        CREATE TABLE entries (
            entry_id TEXT NOT NULL, version INTEGER NOT NULL, name TEXT NOT NULL, family TEXT NOT NULL, ion TEXT NOT NULL,
            reversal_rule TEXT NOT NULL, reversal_mv REAL, temperature_c REAL NOT NULL, q10 REAL NOT NULL,
            density_typical REAL NOT NULL, density_min REAL NOT NULL, density_max REAL NOT NULL,
            preparation TEXT NOT NULL, curator_note TEXT NOT NULL, source_id INTEGER NOT NULL REFERENCES sources(source_id),
            source_file TEXT NOT NULL, source_density_value REAL, source_density_unit TEXT, source_density_capacitance_pf REAL,
            source_density_area_um2 REAL, source_density_specific_capacitance REAL, source_density_where TEXT,
            PRIMARY KEY (entry_id, version));
        CREATE TABLE gates (
            entry_id TEXT NOT NULL, version INTEGER NOT NULL, ordinal INTEGER NOT NULL, name TEXT NOT NULL,
            power INTEGER NOT NULL, kind TEXT NOT NULL, instantaneous INTEGER NOT NULL, rate_factor REAL NOT NULL,
            ca_half_mm REAL, ca_hill REAL, ca_tau_ms REAL, na_half_mm REAL, na_hill REAL, na_tau_ms REAL,
            PRIMARY KEY (entry_id, version, ordinal), FOREIGN KEY (entry_id, version) REFERENCES entries(entry_id, version));
        CREATE TABLE gate_rates (
            entry_id TEXT NOT NULL, version INTEGER NOT NULL, gate_ordinal INTEGER NOT NULL,
            role TEXT NOT NULL CHECK (role IN ('alpha', 'beta', 'steady', 'tau')), shape TEXT NOT NULL,
            a REAL NOT NULL, v0 REAL NOT NULL, k REAL NOT NULL, exponent REAL NOT NULL, floor REAL NOT NULL,
            base REAL NOT NULL, v1 REAL NOT NULL, k1 REAL NOT NULL, c1 REAL NOT NULL, c2 REAL NOT NULL,
            PRIMARY KEY (entry_id, version, gate_ordinal, role));
        CREATE TABLE published_values (
            entry_id TEXT NOT NULL, version INTEGER NOT NULL, quantity TEXT NOT NULL, gate TEXT NOT NULL,
            value REAL NOT NULL, at_mv REAL NOT NULL, tolerance REAL NOT NULL, location TEXT NOT NULL);
        CREATE TABLE gene_links (
            species TEXT NOT NULL, symbol TEXT NOT NULL, entry_id TEXT NOT NULL, weight REAL NOT NULL, role TEXT NOT NULL,
            reason TEXT NOT NULL, PRIMARY KEY (species, symbol, entry_id));
        CREATE TABLE gene_status (
            species TEXT NOT NULL, symbol TEXT NOT NULL, status TEXT NOT NULL, reason TEXT NOT NULL,
            PRIMARY KEY (species, symbol));
        CREATE TABLE gene_identifiers (
            identifier TEXT NOT NULL, kind TEXT NOT NULL, symbol TEXT NOT NULL, species TEXT NOT NULL);
        CREATE INDEX gene_identifiers_by_id ON gene_identifiers(identifier);
        CREATE TABLE presets (preset_id TEXT PRIMARY KEY, name TEXT NOT NULL, citation TEXT NOT NULL, model_json TEXT NOT NULL);
        CREATE TABLE unitary_conductances (
            key TEXT PRIMARY KEY, conductance_ps REAL NOT NULL, family_default INTEGER NOT NULL, citation TEXT NOT NULL, note TEXT NOT NULL);
        """;

    /// <summary>Parses every source (failing with file and line on the first bad one) and writes the database.</summary>
    public static CatalogContent Build(CatalogSources sources, string databasePath)
    {
        var content = CatalogContent.Parse(sources);
        var dir = Path.GetDirectoryName(Path.GetFullPath(databasePath))!;
        Directory.CreateDirectory(dir);
        var tmp = Path.Combine(dir, $".{Path.GetFileName(databasePath)}.{Environment.ProcessId}.{Guid.NewGuid():N}.tmp");
        try
        {
            using (var conn = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = tmp, Pooling = false }.ToString()))
            {
                conn.Open();
                using var tx = conn.BeginTransaction();
                Exec(conn, tx, Schema);
                WriteMeta(conn, tx, sources, content);
                WriteEntries(conn, tx, content);
                WriteGenes(conn, tx, content);
                foreach (var (id, doc) in content.Presets.OrderBy(p => p.Key, StringComparer.Ordinal))
                    Insert(conn, tx, "INSERT INTO presets VALUES ($a,$b,$c,$d)", id, doc.Name, doc.Citation, doc.ToJson());
                foreach (var u in content.UnitaryConductances.Rows)
                    Insert(conn, tx, "INSERT INTO unitary_conductances VALUES ($a,$b,$c,$d,$e)", u.Key, u.ConductancePs, u.IsFamilyDefault ? 1 : 0,
                        u.Citation, u.Note);
                tx.Commit();
            }
            File.Move(tmp, databasePath, overwrite: true);
        }
        finally
        {
            if (File.Exists(tmp)) File.Delete(tmp);
        }
        return content;
    }

    private static void WriteMeta(SqliteConnection conn, SqliteTransaction tx, CatalogSources sources, CatalogContent content)
    {
        Insert(conn, tx, "INSERT INTO meta VALUES ($a,$b)", "schema_version", SchemaVersion.ToString(CultureInfo.InvariantCulture));
        Insert(conn, tx, "INSERT INTO meta VALUES ($a,$b)", "source_hash", sources.ContentHash());
        Insert(conn, tx, "INSERT INTO meta VALUES ($a,$b)", "source_origin", sources.Origin);
        Insert(conn, tx, "INSERT INTO meta VALUES ($a,$b)", "entry_count", content.Entries.Count.ToString(CultureInfo.InvariantCulture));
        foreach (var (k, v) in content.Provenance.OrderBy(p => p.Key, StringComparer.Ordinal))
            Insert(conn, tx, "INSERT INTO meta VALUES ($a,$b)", "identifiers." + k, v);
    }

    private static void WriteEntries(SqliteConnection conn, SqliteTransaction tx, CatalogContent content)
    {
        long sourceId = 0;
        foreach (var (e, file) in content.Entries.Zip(content.EntryFiles))
        {
            var s = e.Source;
            sourceId++;
            Insert(conn, tx, "INSERT INTO sources VALUES ($a,$b,$c,$d,$e,$f,$g,$h,$i,$j,$k,$l,$m)",
                sourceId, s.Authors, s.Year, s.Title, s.Journal, s.Volume, s.Pages, s.Doi, s.Location, Word(s.Verification),
                Word(s.CitationCheck), s.CitationCheckedAt, s.CitationNote);
            var d = e.SourceDensity;
            Insert(conn, tx, "INSERT INTO entries VALUES ($a,$b,$c,$d,$e,$f,$g,$h,$i,$j,$k,$l,$m,$n,$o,$p,$q,$r,$s,$t,$u,$v)",
                e.Id, e.Version, e.Name, e.Family, Word(e.Ion), Word(e.Reversal), e.ReversalMv, e.ReferenceTemperatureC, e.Q10,
                e.TypicalDensityMsPerCm2, e.MinDensityMsPerCm2, e.MaxDensityMsPerCm2, e.Preparation, e.CuratorNote, sourceId, file,
                d?.Value, d?.Unit, d?.CapacitancePf, d?.AreaUm2, d?.CapacitanceUfPerCm2, d?.Where);
            for (int i = 0; i < e.Gates.Count; i++)
            {
                var g = e.Gates[i];
                Insert(conn, tx, "INSERT INTO gates VALUES ($a,$b,$c,$d,$e,$f,$g,$h,$i,$j,$k,$l,$m,$n)",
                    e.Id, e.Version, i, g.Name, g.Power, Word(g.Kind), g.Instantaneous ? 1 : 0, g.RateFactor,
                    g.Calcium?.HalfActivationMm, g.Calcium?.HillCoefficient, g.Calcium?.TimeConstantMs,
                    g.Sodium?.HalfActivationMm, g.Sodium?.HillCoefficient, g.Sodium?.TimeConstantMs);
                foreach (var (role, r) in new[] { ("alpha", g.Alpha), ("beta", g.Beta), ("steady", g.SteadyState), ("tau", g.TimeConstantMs) })
                {
                    if (r is null) continue;
                    Insert(conn, tx, "INSERT INTO gate_rates VALUES ($a,$b,$c,$d,$e,$f,$g,$h,$i,$j,$k,$l,$m,$n,$o)",
                        e.Id, e.Version, i, role, Word(r.Shape), r.A, r.V0, r.K, r.Exponent, r.Floor, r.Base, r.V1, r.K1, r.C1, r.C2);
                }
            }
            foreach (var p in e.PublishedValues)
                Insert(conn, tx, "INSERT INTO published_values VALUES ($a,$b,$c,$d,$e,$f,$g,$h)",
                    e.Id, e.Version, p.Quantity, p.Gate, p.Value, p.AtMv, p.Tolerance, p.Where);
        }
    }

    private static void WriteGenes(SqliteConnection conn, SqliteTransaction tx, CatalogContent content)
    {
        foreach (var l in content.GeneLinks)
            Insert(conn, tx, "INSERT INTO gene_links VALUES ($a,$b,$c,$d,$e,$f)", Word(l.Species), l.Symbol, l.EntryId, l.Weight, l.Role, l.Reason);
        foreach (var s in content.GeneStatuses)
            Insert(conn, tx, "INSERT INTO gene_status VALUES ($a,$b,$c,$d)", Word(s.Species), s.Symbol, s.Status, s.Reason);
        foreach (var i in content.GeneIdentifiers)
            Insert(conn, tx, "INSERT INTO gene_identifiers VALUES ($a,$b,$c,$d)", i.Identifier, i.Kind, i.Symbol, Word(i.Species));
    }

    public static string Word<T>(T value) where T : struct, Enum =>
        System.Text.Json.JsonNamingPolicy.KebabCaseLower.ConvertName(value.ToString());

    private static void Exec(SqliteConnection conn, SqliteTransaction tx, string sql)
    {
        using var cmd = conn.CreateCommand();
        cmd.Transaction = tx;
        cmd.CommandText = sql;
        cmd.ExecuteNonQuery();
    }

    private static void Insert(SqliteConnection conn, SqliteTransaction tx, string sql, params object?[] values)
    {
        using var cmd = conn.CreateCommand();
        cmd.Transaction = tx;
        cmd.CommandText = sql;
        for (int i = 0; i < values.Length; i++)
            cmd.Parameters.AddWithValue("$" + (char)('a' + i), values[i] ?? DBNull.Value);
        cmd.ExecuteNonQuery();
    }
}
