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
        AtomicFile.WriteAllText(path, text);
        Error.WriteLine($"wrote {path}");
    }

    /// <summary>Streams text to a file atomically (temp file then rename) or to stdout when no path is given.</summary>
    public void Emit(Action<TextWriter> write, string? path)
    {
        if (string.IsNullOrEmpty(path) || path == "-")
        {
            write(Out);
            return;
        }
        AtomicFile.Write(path, s =>
        {
            using var w = new StreamWriter(s, new System.Text.UTF8Encoding(encoderShouldEmitUTF8Identifier: false), 1 << 16, leaveOpen: true);
            write(w);
        });
        Error.WriteLine($"wrote {path}");
    }
}
