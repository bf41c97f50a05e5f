using System.Formats.Tar;
using System.IO.Compression;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Workspace;

/// <summary>
/// Opens an uploaded .zip or .tar.gz (or plain .tar) archive into a private folder, entry by entry, so its files can
/// be read like separate uploads. Recognised by content (zip local-file signature; a tar header's "ustar" magic, inside
/// gzip or not), not by name. Hostile archives are refused with the entry named: an entry name that is absolute or
/// climbs with "..", a link, more than <see cref="MaxEntries"/> files, or more inflated bytes in all than the server's
/// decompressed-size limit (counted while inflating, so sizes a zip header claims are not trusted). Entries are written
/// under numbered folders by their own file names only, never by the path the archive gives.
/// </summary>
public static class UploadArchive
{
    /// <summary>Most files one archive may hold (a matrix, its two sidecars and room for a few more).</summary>
    public const int MaxEntries = 64;

    private static ReadOnlySpan<byte> ZipLocalFile => [0x50, 0x4b, 0x03, 0x04];
    private static ReadOnlySpan<byte> ZipEmpty => [0x50, 0x4b, 0x05, 0x06];
    /// <summary>POSIX tar: "ustar" at offset 257 of a header block (POSIX.1-1988 ustar; GNU tar writes "ustar " there too).</summary>
    private static ReadOnlySpan<byte> TarMagic => "ustar"u8;
    private const int TarMagicOffset = 257;

    public enum Kind { None, Zip, Tar, GzipTar }

    /// <summary>
    /// What kind of archive the file is, by content. Zip signature bytes count only when the zip's directory opens or the
    /// name ends in .zip, so a damaged file sent as a table is reported as a table (by the table's own checks).
    /// </summary>
    public static Kind Detect(UploadedFile file)
    {
        var bytes = file.Bytes;
        if (bytes.AsSpan().StartsWith(ZipLocalFile) || bytes.AsSpan().StartsWith(ZipEmpty))
            return file.Name.EndsWith(".zip", StringComparison.OrdinalIgnoreCase) || OpensAsZip(bytes) ? Kind.Zip : Kind.None;
        if (IsTarHeader(bytes)) return Kind.Tar;
        if (bytes.Length >= 2 && bytes[0] == 0x1f && bytes[1] == 0x8b)
        {
            var head = new byte[TarMagicOffset + TarMagic.Length];
            try
            {
                using var gz = new GZipStream(new MemoryStream(bytes, writable: false), CompressionMode.Decompress);
                int n = gz.ReadAtLeast(head, head.Length, throwOnEndOfStream: false);
                if (n == head.Length && IsTarHeader(head)) return Kind.GzipTar;
            }
            catch (InvalidDataException) { } // damaged gzip: the table reader reports it with its own message
        }
        return Kind.None;
    }

    private static bool OpensAsZip(byte[] bytes)
    {
        try
        {
            using var zip = new ZipArchive(new MemoryStream(bytes, writable: false), ZipArchiveMode.Read);
            return zip.Entries.Count >= 0;
        }
        catch (InvalidDataException) { return false; }
    }

    private static bool IsTarHeader(ReadOnlySpan<byte> block) =>
        block.Length >= TarMagicOffset + TarMagic.Length && block.Slice(TarMagicOffset, TarMagic.Length).SequenceEqual(TarMagic);

    /// <summary>
    /// Writes the archive's files into <paramref name="folder"/> and returns them in archive order. Folders and the
    /// clutter desktop tools add (__MACOSX/, ._ files, .DS_Store) are skipped.
    /// </summary>
    /// <exception cref="UserInputException">Not a readable archive, or a refused entry (named).</exception>
    /// <exception cref="UploadTooLargeException">The entries inflate past <paramref name="maxBytes"/>.</exception>
    public static IReadOnlyList<ReceivedFile> Expand(UploadedFile archive, string folder, long maxBytes, CancellationToken cancel = default)
    {
        var kind = Detect(archive);
        var budget = new Budget(archive.Name, maxBytes);
        try
        {
            return kind switch
            {
                Kind.Zip => ExpandZip(archive, folder, budget, cancel),
                Kind.Tar => ExpandTar(archive, new MemoryStream(archive.Bytes, writable: false), folder, budget, cancel),
                Kind.GzipTar => ExpandTar(archive, new GZipStream(new MemoryStream(archive.Bytes, writable: false), CompressionMode.Decompress), folder,
                    budget, cancel),
                _ => throw new UserInputException($"{archive.Name}: not a zip or tar archive."),
            };
        }
        catch (InvalidDataException e)
        {
            throw new UserInputException($"{archive.Name}: the archive is damaged or truncated ({e.Message}).");
        }
        catch (EndOfStreamException)
        {
            throw new UserInputException($"{archive.Name}: the archive is truncated (it ends inside an entry).");
        }
    }

    private static List<ReceivedFile> ExpandZip(UploadedFile archive, string folder, Budget budget, CancellationToken cancel)
    {
        using var zip = new ZipArchive(new MemoryStream(archive.Bytes, writable: false), ZipArchiveMode.Read);
        var files = new List<ReceivedFile>();
        foreach (var entry in zip.Entries)
        {
            cancel.ThrowIfCancellationRequested();
            var name = CheckedName(archive.Name, entry.FullName);
            if (name is null || entry.FullName.EndsWith('/')) continue;
            if (entry.IsEncrypted) throw new UserInputException($"{archive.Name}: entry '{entry.FullName}' is encrypted; send it unencrypted.");
            using var data = entry.Open();
            files.Add(Write(archive, folder, files.Count, name, data, budget, cancel));
        }
        return files;
    }

    private static List<ReceivedFile> ExpandTar(UploadedFile archive, Stream stream, string folder, Budget budget, CancellationToken cancel)
    {
        using var counted = new BudgetStream(stream, budget);
        using var tar = new TarReader(counted);
        var files = new List<ReceivedFile>();
        while (tar.GetNextEntry(copyData: false) is { } entry)
        {
            cancel.ThrowIfCancellationRequested();
            switch (entry.EntryType)
            {
                case TarEntryType.Directory or TarEntryType.GlobalExtendedAttributes:
                    continue;
                case TarEntryType.SymbolicLink or TarEntryType.HardLink:
                    throw new UserInputException($"{archive.Name}: entry '{entry.Name}' is a link ({entry.EntryType}); archives with links are refused.");
                case TarEntryType.RegularFile or TarEntryType.V7RegularFile or TarEntryType.ContiguousFile:
                    break;
                default:
                    throw new UserInputException($"{archive.Name}: entry '{entry.Name}' is a {entry.EntryType} entry, not a file; only files are read.");
            }
            var name = CheckedName(archive.Name, entry.Name);
            if (name is null) continue;
            using var data = entry.DataStream ?? Stream.Null;
            files.Add(Write(archive, folder, files.Count, name, data, null, cancel)); // counted by the tar stream
        }
        return files;
    }

    /// <summary>
    /// Several uploaded files as one zip (each under its own file name), so an upload of Matrix Market parts can be kept
    /// with a shared model as one file and read back through <see cref="Expand"/>.
    /// </summary>
    public static byte[] Pack(IReadOnlyList<UploadedFile> files)
    {
        using var buffer = new MemoryStream();
        using (var zip = new ZipArchive(buffer, ZipArchiveMode.Create, leaveOpen: true))
        {
            var used = new HashSet<string>(StringComparer.Ordinal);
            foreach (var file in files)
            {
                var name = ExpressionSession.SafeName(Path.GetFileName(file.Name), "part");
                for (int k = 2; !used.Add(name); k++) name = $"{k}-{ExpressionSession.SafeName(Path.GetFileName(file.Name), "part")}";
                using var entry = zip.CreateEntry(name, CompressionLevel.Optimal).Open();
                entry.Write(file.Bytes);
            }
        }
        return buffer.ToArray();
    }

    /// <summary>
    /// The entry's name with '/' separators, or null for clutter to skip. Refuses names that would leave the folder
    /// if used as paths: absolute, a drive letter, or a ".." segment (checked with both separators).
    /// </summary>
    internal static string? CheckedName(string archiveName, string entryName)
    {
        var name = entryName.Replace('\\', '/');
        var segments = name.Split('/');
        if (name.StartsWith('/') || (name.Length >= 2 && name[1] == ':' && char.IsAsciiLetter(name[0])) || segments.Contains("..")
            || name.Contains('\0'))
            throw new UserInputException($"{archiveName}: entry '{entryName.Replace("\0", "\\0")}' points outside the archive "
                + "(an absolute path or '..'); such archives are refused.");
        var file = segments[^1];
        if (file.Length == 0 || segments.Contains("__MACOSX") || file.StartsWith("._", StringComparison.Ordinal) || file == ".DS_Store") return null;
        return string.Join('/', segments.Where(s => s is not ("" or ".")));
    }

    private static ReceivedFile Write(UploadedFile archive, string folder, int index, string name, Stream data, Budget? budget,
        CancellationToken cancel)
    {
        if (index >= MaxEntries)
            throw new UserInputException($"{archive.Name}: more than {MaxEntries} files; send the matrix and its sidecar files only.");
        var dir = Directory.CreateDirectory(Path.Combine(folder, (index + 1).ToString(System.Globalization.CultureInfo.InvariantCulture))).FullName;
        var path = Path.Combine(dir, ExpressionSession.SafeName(name[(name.LastIndexOf('/') + 1)..], "entry"));
        using (var output = new FileStream(path, FileMode.CreateNew, FileAccess.Write))
        {
            var buffer = new byte[81920];
            int n;
            while ((n = data.Read(buffer)) > 0)
            {
                cancel.ThrowIfCancellationRequested();
                budget?.Take(n, $"{archive.Name}/{name}");
                output.Write(buffer, 0, n);
            }
        }
        return new ReceivedFile($"{archive.Name}/{name}", path);
    }

    /// <summary>The inflated bytes one archive may still produce; shared by every entry.</summary>
    private sealed class Budget(string archiveName, long maxBytes)
    {
        private long _used;

        public void Take(long bytes, string? entry = null)
        {
            _used += bytes;
            if (_used > maxBytes)
                throw new UploadTooLargeException($"{entry ?? archiveName}: the archive inflates past this server's limit of "
                    + $"{maxBytes / (1024.0 * 1024.0):0.##} MB ({WebOptions.Section}:MaxDecompressedMegabytes); a decompression bomb, or send "
                    + "fewer or smaller files.");
        }
    }

    /// <summary>Counts a tar stream's inflated bytes (headers and padding too) against the budget as they are read.</summary>
    private sealed class BudgetStream(Stream inner, Budget budget) : Stream
    {
        public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

        public override int Read(Span<byte> buffer)
        {
            int n = inner.Read(buffer);
            budget.Take(n);
            return n;
        }

        public override bool CanRead => true;
        public override bool CanSeek => false;
        public override bool CanWrite => false;
        public override long Length => throw new NotSupportedException();
        public override long Position { get => throw new NotSupportedException(); set => throw new NotSupportedException(); }
        public override void Flush() { }
        public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
        public override void SetLength(long value) => throw new NotSupportedException();
        public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
        protected override void Dispose(bool disposing) { if (disposing) inner.Dispose(); base.Dispose(disposing); }
    }
}
