using ExprModel.Data.Catalog;

namespace ExprModel.Cli.Tests;

/// <summary>Runs the CLI in-process against a catalog database built for this test run.</summary>
public static class CliRunner
{
    private static readonly Lazy<string> Db = new(() =>
    {
        var path = Path.Combine(Path.GetTempPath(), $"exprmodel-cli-tests-{Environment.ProcessId}.db");
        CatalogLocator.Ensure(path);
        return path;
    });

    public static (int Exit, string Out, string Err) Run(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        bool wantsDb = args.Length > 0 && args[0] != "merge" && args[0] != "snapshots" && args[0] != "slurm-array"
            && (args[0] != "catalog" || args.Length > 1 && args[1] != "build");
        var full = wantsDb && !args.Contains("--db") ? [.. args, "--db", Db.Value] : args;
        int code = CliApp.Run(full, o, e);
        return (code, o.ToString(), e.ToString());
    }
}
