using System.Formats.Tar;
using System.IO.Compression;
using System.Text;
using ExprModel.Web.Hosting;
using ExprModel.Web.Simulation;
using ExprModel.Web.Workspace;

namespace ExprModel.Web.Tests.Workspace;

/// <summary>
/// Archives written by the .NET runtime's own zip and tar writers (System.IO.Compression, System.Formats.Tar) and by
/// Debian's GNU tar are opened; hostile ones (path traversal, links, too many entries, inflation bombs) are refused
/// with the entry named.
/// </summary>
public sealed class UploadArchiveTests : IDisposable
{
    private readonly string _dir = Directory.CreateDirectory(Path.Combine(Path.GetTempPath(), "exprmodel-archive-tests-" + Guid.NewGuid().ToString("N")))
        .FullName;

    public void Dispose()
    {
        try { Directory.Delete(_dir, recursive: true); } catch (IOException) { }
    }

    internal static byte[] Zip(params (string Name, byte[] Bytes)[] entries)
    {
        using var buffer = new MemoryStream();
        using (var zip = new ZipArchive(buffer, ZipArchiveMode.Create, leaveOpen: true))
            foreach (var (name, bytes) in entries)
            {
                using var s = zip.CreateEntry(name, CompressionLevel.SmallestSize).Open();
                s.Write(bytes);
            }
        return buffer.ToArray();
    }

    internal static byte[] TarGz(params (string Name, byte[] Bytes)[] entries) => TarGz(entries.Select(e => (TarEntry)File(e.Name, e.Bytes)).ToArray());

    internal static byte[] TarGz(params TarEntry[] entries)
    {
        using var buffer = new MemoryStream();
        using (var gz = new GZipStream(buffer, CompressionLevel.SmallestSize, leaveOpen: true))
        using (var tar = new TarWriter(gz, TarEntryFormat.Pax))
            foreach (var e in entries) tar.WriteEntry(e);
        return buffer.ToArray();
    }

    private static PaxTarEntry File(string name, byte[] bytes) => new(TarEntryType.RegularFile, name) { DataStream = new MemoryStream(bytes) };

    private static readonly byte[] Text = "line\n"u8.ToArray();

    [Fact]
    public void A_zip_opens_to_its_files_named_by_archive_and_entry()
    {
        var files = UploadArchive.Expand(new UploadedFile("s.zip", Zip(("run/matrix.mtx", Text), ("run/genes.tsv", Text), ("__MACOSX/._x", Text))),
            _dir, 1 << 20);
        Assert.Equal(["s.zip/run/matrix.mtx", "s.zip/run/genes.tsv"], files.Select(f => f.Name));
        Assert.All(files, f => Assert.StartsWith(_dir, f.Path));
        Assert.Equal("line\n", System.IO.File.ReadAllText(files[0].Path));
        Assert.Equal("genes.tsv", files[1].FileName);
    }

    [Fact]
    public void A_tar_gz_written_by_the_runtime_opens_skipping_folders()
    {
        var bytes = TarGz(new PaxTarEntry(TarEntryType.Directory, "run/"), File("run/barcodes.tsv", Text));
        Assert.Equal(UploadArchive.Kind.GzipTar, UploadArchive.Detect(new UploadedFile("anything.bin", bytes)));
        var files = UploadArchive.Expand(new UploadedFile("s.tar.gz", bytes), _dir, 1 << 20);
        Assert.Equal(["s.tar.gz/run/barcodes.tsv"], files.Select(f => f.Name));
    }

    [Fact]
    public void A_tar_gz_written_by_gnu_tar_opens()
    {
        // Debian's tar (GNU tar), an archive not written by the runtime that reads it.
        var src = Directory.CreateDirectory(Path.Combine(_dir, "src", "sample")).FullName;
        System.IO.File.WriteAllText(Path.Combine(src, "genes.tsv"), "Scn1a\nKcnc1\n");
        var archive = Path.Combine(_dir, "sample.tar.gz");
        using (var tar = System.Diagnostics.Process.Start("tar", ["-czf", archive, "-C", Path.Combine(_dir, "src"), "sample"])) tar.WaitForExit();
        var files = UploadArchive.Expand(new UploadedFile("sample.tar.gz", System.IO.File.ReadAllBytes(archive)), Path.Combine(_dir, "out"), 1 << 20);
        Assert.Equal(["sample.tar.gz/sample/genes.tsv"], files.Select(f => f.Name));
        Assert.Equal("Scn1a\nKcnc1\n", System.IO.File.ReadAllText(files[0].Path));
    }

    [Theory]
    [InlineData("../evil.tsv")]
    [InlineData("run/../../evil.tsv")]
    [InlineData("/etc/evil.tsv")]
    [InlineData("C:/evil.tsv")]
    [InlineData("..\\evil.tsv")]
    public void Entry_names_that_leave_the_folder_are_refused_in_zip_and_tar(string name)
    {
        var zip = Assert.Throws<UserInputException>(() => UploadArchive.Expand(new UploadedFile("bad.zip", Zip((name, Text))), _dir, 1 << 20));
        Assert.Contains($"bad.zip: entry '{name}' points outside the archive", zip.Message);
        var tar = Assert.Throws<UserInputException>(() => UploadArchive.Expand(new UploadedFile("bad.tar.gz", TarGz((name, Text))), _dir, 1 << 20));
        Assert.Contains("points outside the archive", tar.Message);
        Assert.Empty(Directory.EnumerateFiles(_dir, "evil.tsv", SearchOption.AllDirectories));
    }

    [Fact]
    public void Links_are_refused()
    {
        var bytes = TarGz(new PaxTarEntry(TarEntryType.SymbolicLink, "genes.tsv") { LinkName = "/etc/passwd" });
        var e = Assert.Throws<UserInputException>(() => UploadArchive.Expand(new UploadedFile("l.tar.gz", bytes), _dir, 1 << 20));
        Assert.Contains("l.tar.gz: entry 'genes.tsv' is a link", e.Message);
    }

    [Fact]
    public void A_zip_bomb_stops_at_the_inflation_limit_whatever_its_header_says()
    {
        var bomb = Zip(("matrix.mtx", new byte[3_000_000]));
        Assert.True(bomb.Length < 10_000);
        var e = Assert.Throws<UploadTooLargeException>(() => UploadArchive.Expand(new UploadedFile("bomb.zip", bomb), _dir, 1_000_000));
        Assert.Contains("bomb.zip/matrix.mtx: the archive inflates past", e.Message);
        Assert.Contains("MaxDecompressedMegabytes", e.Message);
        var tar = Assert.Throws<UploadTooLargeException>(() =>
            UploadArchive.Expand(new UploadedFile("bomb.tar.gz", TarGz(("m.mtx", new byte[3_000_000]))), _dir, 1_000_000));
        Assert.Contains("bomb.tar.gz", tar.Message);
    }

    [Fact]
    public void More_than_the_entry_limit_is_refused()
    {
        var many = Enumerable.Range(0, UploadArchive.MaxEntries + 1).Select(i => ($"f{i}.tsv", Text)).ToArray();
        var e = Assert.Throws<UserInputException>(() => UploadArchive.Expand(new UploadedFile("many.zip", Zip(many)), _dir, 1 << 20));
        Assert.Contains($"more than {UploadArchive.MaxEntries} files", e.Message);
    }

    [Fact]
    public void Damaged_archives_are_named_and_zip_like_junk_sent_as_a_table_is_left_to_the_table_checks()
    {
        var zip = Zip(("matrix.mtx", Encoding.ASCII.GetBytes(new string('1', 5000))));
        var e = Assert.Throws<UserInputException>(() => UploadArchive.Expand(new UploadedFile("cut.zip", zip[..(zip.Length / 2)]), _dir, 1 << 20));
        Assert.Contains("cut.zip: the archive is damaged or truncated", e.Message);
        Assert.Equal(UploadArchive.Kind.None, UploadArchive.Detect(new UploadedFile("garbage.csv", [0x50, 0x4b, 0x03, 0x04, 0, 0, 0xff, 0xfe])));
    }

    [Fact]
    public void Packed_files_open_again_under_their_names()
    {
        var packed = UploadArchive.Pack([new UploadedFile("matrix.mtx", Text), new UploadedFile("genes.tsv", "g\n"u8.ToArray())]);
        var files = UploadArchive.Expand(new UploadedFile("p.zip", packed), _dir, 1 << 20);
        Assert.Equal(["p.zip/matrix.mtx", "p.zip/genes.tsv"], files.Select(f => f.Name));
        Assert.Equal("g\n", System.IO.File.ReadAllText(files[1].Path));
    }
}
