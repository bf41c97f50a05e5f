using ExprModel.Data.Catalog;

namespace ExprModel.Cli;

/// <summary>Where a command writes, and the catalog it uses (opened on first need).</summary>
public sealed class CliContext(TextWriter stdout, TextWriter stderr)
{
    private ChannelCatalog? _catalog;
    public TextWriter Out { get; } = stdout;
    public TextWriter Error { get; } = stderr;
    public string? DatabasePath { get; set; }

    public ChannelCatalog Catalog => _catalog ??= CatalogLocator.Ensure(DatabasePath);

    /// <summary>Writes text to a file atomically (temp file then rename) or to stdout when no path is given.</summary>
    public void Emit(string text, string? path)
    {
        if (string.IsNullOrEmpty(path) || path == "-")
        {
            Out.Write(text);
            return;
        }
        var full = Path.GetFullPath(path);
        var tmp = full + $".{Environment.ProcessId}.tmp";
        File.WriteAllText(tmp, text);
        File.Move(tmp, full, overwrite: true);
        Error.WriteLine($"wrote {path}");
    }
}
