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
