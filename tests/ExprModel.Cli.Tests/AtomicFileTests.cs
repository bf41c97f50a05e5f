namespace ExprModel.Cli.Tests;

public class AtomicFileTests
{
    private static string NewDirectory()
    {
        var dir = Path.Combine(Path.GetTempPath(), $"atomic-{Guid.NewGuid():N}");
        Directory.CreateDirectory(dir);
        return dir;
    }

    [Fact]
    public void WritesAndReplacesTheFileLeavingNoTemporaryFile()
    {
        var dir = NewDirectory();
        var path = Path.Combine(dir, "shard 1 'of' 2.csv");
        AtomicFile.WriteAllText(path, "first\n");
        AtomicFile.WriteAllText(path, "second\n");
        Assert.Equal("second\n", File.ReadAllText(path));
        Assert.Equal([path], Directory.GetFiles(dir));
        Directory.Delete(dir, recursive: true);
    }

    [Fact]
    public void AWriteThatFailsHalfWayLeavesTheOldFileWholeAndNoTemporaryFile()
    {
        var dir = NewDirectory();
        var path = Path.Combine(dir, "merged.csv");
        File.WriteAllText(path, "old table\n");
        var e = Assert.Throws<IOException>(() => AtomicFile.Write(path, s =>
        {
            s.Write("item_index,item\n0,a\n"u8);
            throw new IOException("disk full (simulated)");
        }));
        Assert.Equal("disk full (simulated)", e.Message);
        Assert.Equal("old table\n", File.ReadAllText(path));
        Assert.Equal([path], Directory.GetFiles(dir));
        // A new file that fails half-way is not created at all.
        var fresh = Path.Combine(dir, "new.csv");
        Assert.Throws<IOException>(() => AtomicFile.Write(fresh, s => { s.Write("0,a\n"u8); throw new IOException("killed"); }));
        Assert.False(File.Exists(fresh));
        Assert.Equal([path], Directory.GetFiles(dir));
        Directory.Delete(dir, recursive: true);
    }

    [Fact]
    public void TheTemporaryFileSitsBesideTheTargetSoTheRenameStaysOnOneFileSystem()
    {
        var dir = NewDirectory();
        var path = Path.Combine(dir, "out.csv");
        string[] during = [];
        AtomicFile.Write(path, s =>
        {
            s.Write("x\n"u8);
            during = Directory.GetFiles(dir);
        });
        var tmp = Assert.Single(during);
        Assert.StartsWith(".out.csv.", Path.GetFileName(tmp));
        Assert.EndsWith(AtomicFile.TemporarySuffix, tmp);
        Assert.False(File.Exists(tmp));
        Directory.Delete(dir, recursive: true);
    }
}
