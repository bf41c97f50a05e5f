using System.Diagnostics;
using Microsoft.Data.Sqlite;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>
/// Debian's r-bioc-org.hs.eg.db (NCBI Gene 2022-09, Ensembl 2022-06), fetched with apt-get download and unpacked with
/// dpkg -x into a cache under /tmp (DOMAIN.md), read as plain SQLite. Downloaded once per machine (about 37 MB).
/// </summary>
public static class GenePackage
{
    public const string Package = "r-bioc-org.hs.eg.db";
    public static readonly string CacheDirectory = Path.Combine(Path.GetTempPath(), "exprmodel-orghs");
    private const string SqliteInPackage = "usr/lib/R/site-library/org.Hs.eg.db/extdata/org.Hs.eg.sqlite";

    /// <summary>Why the package cannot be fetched here (no apt-get or dpkg), or null when it can.</summary>
    public static string? Unavailable =>
        OnPath("apt-get") && OnPath("dpkg") ? null : "apt-get and dpkg are not available on this machine, so Debian's r-bioc-org.hs.eg.db cannot be fetched";

    private static readonly Lazy<string> Path_ = new(Fetch);
    public static string SqlitePath => Path_.Value;

    private static bool OnPath(string tool) =>
        (Environment.GetEnvironmentVariable("PATH") ?? "").Split(':').Any(d => d.Length > 0 && File.Exists(Path.Combine(d, tool)));

    private static string Fetch()
    {
        Directory.CreateDirectory(CacheDirectory);
        var root = Path.Combine(CacheDirectory, "root");
        var sqlite = Path.Combine(root, SqliteInPackage);
        if (File.Exists(sqlite)) return sqlite;
        var deb = Directory.GetFiles(CacheDirectory, Package + "_*.deb").Order(StringComparer.Ordinal).LastOrDefault();
        if (deb is null)
        {
            // Download into a private folder and move the finished file in, so concurrent test runs never read a partial .deb.
            var download = Path.Combine(CacheDirectory, "download-" + Guid.NewGuid().ToString("N"));
            Directory.CreateDirectory(download);
            try
            {
                if (Run("apt-get", $"download {Package}", download) != 0)
                {
                    // Package lists may be missing on a fresh machine: refresh once and retry.
                    Run("apt-get", "update", download);
                    if (Run("apt-get", $"download {Package}", download) != 0) throw new InvalidOperationException($"apt-get download {Package} failed");
                }
                var got = Directory.GetFiles(download, Package + "_*.deb").Single();
                deb = Path.Combine(CacheDirectory, Path.GetFileName(got));
                if (!File.Exists(deb)) File.Move(got, deb);
            }
            finally { Directory.Delete(download, recursive: true); }
        }
        var partial = Path.Combine(CacheDirectory, "root-" + Guid.NewGuid().ToString("N"));
        try
        {
            if (Run("dpkg", $"-x {deb} {partial}", CacheDirectory) != 0) throw new InvalidOperationException($"dpkg -x {deb} failed");
            if (!File.Exists(sqlite))
            {
                if (Directory.Exists(root)) Directory.Delete(root, recursive: true); // an earlier, interrupted unpack
                Directory.Move(partial, root);
            }
        }
        catch (IOException) when (File.Exists(sqlite)) { } // another test run finished the unpack first
        finally { if (Directory.Exists(partial)) Directory.Delete(partial, recursive: true); }
        return sqlite;
    }

    private static int Run(string file, string args, string workingDirectory)
    {
        var psi = new ProcessStartInfo(file, args) { WorkingDirectory = workingDirectory, RedirectStandardOutput = true, RedirectStandardError = true };
        using var p = Process.Start(psi)!;
        p.StandardOutput.ReadToEnd();
        p.StandardError.ReadToEnd();
        p.WaitForExit();
        return p.ExitCode;
    }

    public static SqliteConnection Open()
    {
        var c = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = SqlitePath, Mode = SqliteOpenMode.ReadOnly, Pooling = false }.ToString());
        c.Open();
        return c;
    }

    public static List<string[]> Query(string sql)
    {
        using var c = Open();
        using var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        using var r = cmd.ExecuteReader();
        var rows = new List<string[]>();
        while (r.Read())
        {
            var row = new string[r.FieldCount];
            for (int i = 0; i < row.Length; i++)
                row[i] = r.IsDBNull(i) ? "" : Convert.ToString(r.GetValue(i), System.Globalization.CultureInfo.InvariantCulture)!;
            rows.Add(row);
        }
        return rows;
    }
}

/// <summary>A fact that needs the Debian package; skipped, with the reason, only where apt-get/dpkg do not exist.</summary>
public sealed class GenePackageFactAttribute : FactAttribute
{
    public GenePackageFactAttribute()
    {
        if (GenePackage.Unavailable is { } why) Skip = why;
    }
}
