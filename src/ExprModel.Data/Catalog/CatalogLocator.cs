using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Catalog;

/// <summary>
/// Finds the catalog sources and keeps the database current: it is (re)built when missing or when its recorded
/// source hash differs from the sources' hash ("older than its sources", by content rather than file times).
/// </summary>
public static class CatalogLocator
{
    /// <summary>Environment variable naming a catalog source directory (overrides the search).</summary>
    public const string DirectoryVariable = "EXPRMODEL_CATALOG_DIR";
    /// <summary>Environment variable naming the catalog database file.</summary>
    public const string DatabaseVariable = "EXPRMODEL_CATALOG_DB";

    private static readonly Lock Gate = new();
    private static ChannelCatalog? _cached;

    /// <summary>The catalog/ directory of a checkout above the working directory or the program, if any.</summary>
    public static string? FindSourceDirectory()
    {
        if (Environment.GetEnvironmentVariable(DirectoryVariable) is { Length: > 0 } env) return env;
        foreach (var start in new[] { Directory.GetCurrentDirectory(), AppContext.BaseDirectory })
        {
            for (var d = new DirectoryInfo(start); d is not null; d = d.Parent)
            {
                var c = Path.Combine(d.FullName, "catalog");
                if (Directory.Exists(Path.Combine(c, "entries")) && File.Exists(Path.Combine(d.FullName, "ExprModel.sln"))) return c;
            }
        }
        return null;
    }

    public static CatalogSources DefaultSources() => FindSourceDirectory() is { } dir ? CatalogSources.FromDirectory(dir) : CatalogSources.Embedded();

    public static string DefaultDatabasePath()
    {
        if (Environment.GetEnvironmentVariable(DatabaseVariable) is { Length: > 0 } env) return env;
        var baseDir = Environment.GetFolderPath(Environment.SpecialFolder.LocalApplicationData);
        if (string.IsNullOrEmpty(baseDir)) baseDir = Path.GetTempPath();
        return Path.Combine(baseDir, "exprmodel", "catalog.db");
    }

    /// <summary>
    /// True when the database at <paramref name="path"/> was built from exactly these sources and passes
    /// <c>PRAGMA quick_check</c> (damaged pages under an intact meta table make it stale: it is a cache, rebuilt from sources).
    /// </summary>
    public static bool IsCurrent(string path, CatalogSources sources)
    {
        if (!File.Exists(path)) return false;
        try
        {
            using var conn =
                new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = path, Mode = SqliteOpenMode.ReadOnly, Pooling = false }.ToString());
            conn.Open();
            using var cmd = conn.CreateCommand();
            cmd.CommandText = "SELECT value FROM meta WHERE key = 'source_hash'";
            var hash = cmd.ExecuteScalar() as string;
            cmd.CommandText = "SELECT value FROM meta WHERE key = 'schema_version'";
            var schema = cmd.ExecuteScalar() as string;
            cmd.CommandText = "PRAGMA quick_check";
            if (cmd.ExecuteScalar() as string != "ok") return false;
            return hash == sources.ContentHash() && schema == CatalogBuilder.SchemaVersion.ToString(System.Globalization.CultureInfo.InvariantCulture);
        }
        catch (SqliteException)
        {
            return false;
        }
    }

    /// <summary>Builds the database if needed and opens it.</summary>
    public static ChannelCatalog Ensure(string? databasePath = null, CatalogSources? sources = null)
    {
        databasePath ??= DefaultDatabasePath();
        sources ??= DefaultSources();
        if (!IsCurrent(databasePath, sources)) CatalogBuilder.Build(sources, databasePath);
        try
        {
            return ChannelCatalog.Open(databasePath);
        }
        catch (CatalogException e) when (e.InnerException is SqliteException)
        {
            // Damage quick_check missed: the database is a cache, so rebuild it once from the sources.
            CatalogBuilder.Build(sources, databasePath);
            return ChannelCatalog.Open(databasePath);
        }
    }

    /// <summary>The process-wide default catalog, built on first use.</summary>
    public static ChannelCatalog Default()
    {
        lock (Gate)
        {
            return _cached ??= Ensure();
        }
    }
}
