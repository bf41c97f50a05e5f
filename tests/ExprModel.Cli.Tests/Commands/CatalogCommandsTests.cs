namespace ExprModel.Cli.Tests.Commands;

public class CatalogCommandsTests
{
    [Fact]
    public void BuildListAndShow()
    {
        var db = Path.Combine(Path.GetTempPath(), $"cat-{Guid.NewGuid():N}.db");
        var build = CliRunner.Run("catalog", "build", "--db", db);
        Assert.True(build.Exit == 0, build.Err);
        Assert.True(File.Exists(db));
        var list = CliRunner.Run("catalog", "list", "--db", db, "--format", "csv");
        Assert.Contains("squid-na-hh1952", list.Out);
        Assert.StartsWith("id,version,family", list.Out);
        var show = CliRunner.Run("catalog", "show", "squid-na-hh1952@1", "--db", db);
        Assert.Contains("10.1113/jphysiol.1952.sp004764", show.Out);
        Assert.Contains("recalled", show.Out);
        var missing = CliRunner.Run("catalog", "show", "squid-na-hh1952@9", "--db", db);
        Assert.NotEqual(0, missing.Exit);
        Assert.Contains("no version 9", missing.Err);
        File.Delete(db);
    }
}

public class CatalogGenesAndReportTests
{
    [Fact]
    public void GenesCsvListsSymbolSpeciesStatusAndEntries()
    {
        var (exit, stdout, err) = CliRunner.Run("catalog", "genes", "--format", "csv");
        Assert.True(exit == 0, err);
        var lines = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal("symbol,species,status,entries", lines[0]);
        // SCN1A is the HGNC symbol of Nav1.1 (r-bioc-org.hs.eg.db); it must be linked to a transient sodium entry.
        Assert.Contains(lines, l => l.StartsWith("SCN1A,human,linked,") && l.Contains("traub-na"));
        Assert.Contains(lines, l => l.StartsWith("Scn1a,mouse,linked,"));
        Assert.Contains(lines, l => l.StartsWith("SCN1B,human,auxiliary"));
    }

    [Fact]
    public void ReportShowsEveryEntryWithItsVerificationStatus()
    {
        var (exit, stdout, err) = CliRunner.Run("catalog", "report");
        Assert.True(exit == 0, err);
        Assert.Contains("squid-na-hh1952@2", stdout);
        Assert.Contains("recalled", stdout);
        Assert.Contains("half-activation", stdout);
    }
}
