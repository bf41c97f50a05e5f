using System.Security.Cryptography;
using System.Text;

namespace ExprModel.Data.Tests.Catalog;

/// <summary>
/// catalog/versions.lock pins every entry file's content: a changed entry must be saved as a new version file, never
/// edited in place, so a saved model that names id@version always gets the same kinetics.
/// </summary>
public class VersionLockTests
{
    private static Dictionary<string, string> Lock()
    {
        var lines = File.ReadAllLines(Path.Combine(CatalogFiles.Directory, "versions.lock"));
        Assert.StartsWith("#", lines[0]);
        var map = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var line in lines.Where(l => l.Length > 0 && !l.StartsWith('#')))
        {
            var parts = line.Split(' ');
            Assert.Equal(2, parts.Length);
            Assert.Matches("^[a-z0-9-]+@[0-9]+$", parts[0]);
            Assert.Matches("^[0-9a-f]{64}$", parts[1]);
            Assert.True(map.TryAdd(parts[0], parts[1]), $"versions.lock names {parts[0]} twice");
        }
        return map;
    }

    /// <summary>SHA-256 of the file with CRLF normalised to LF (as catalog/scripts/lock-entries.sh computes it).</summary>
    private static string Hash(string path)
    {
        var bytes = File.ReadAllBytes(path);
        var text = Encoding.UTF8.GetString(bytes).Replace("\r", "");
        return Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(text)));
    }

    [Fact]
    public void Every_entry_file_matches_its_lock_line()
    {
        var locked = Lock();
        foreach (var name in CatalogFiles.EntryFileNames())
        {
            var stem = Path.GetFileNameWithoutExtension(name);
            int cut = stem.LastIndexOf(".v", StringComparison.Ordinal);
            var key = $"{stem[..cut]}@{stem[(cut + 2)..]}";
            Assert.True(locked.TryGetValue(key, out var hash), $"{name} has no line in catalog/versions.lock; run catalog/scripts/lock-entries.sh");
            Assert.True(hash == Hash(Path.Combine(CatalogFiles.Directory, name)),
                $"{name} differs from the content locked as {key}: entries are immutable, save the change as a new version file");
        }
    }

    [Fact]
    public void Every_lock_line_names_an_existing_entry_file()
    {
        var files = CatalogFiles.EntryFileNames().ToHashSet(StringComparer.Ordinal);
        foreach (var key in Lock().Keys)
        {
            var at = key.LastIndexOf('@');
            Assert.Contains($"entries/{key[..at]}.v{key[(at + 1)..]}.json", files);
        }
    }

    [Fact]
    public void Lock_hash_detects_an_edit()
    {
        // The check above can fail: one changed character changes the hash.
        var any = Path.Combine(CatalogFiles.Directory, CatalogFiles.EntryFileNames().First());
        var tmp = Path.GetTempFileName();
        try
        {
            File.WriteAllText(tmp, File.ReadAllText(any).Replace("\"version\": 1", "\"version\": 1 "));
            Assert.NotEqual(Hash(any), Hash(tmp));
        }
        finally { File.Delete(tmp); }
    }
}
