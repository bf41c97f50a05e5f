using System.CommandLine;
using ExprModel.Data.Store;

namespace ExprModel.Cli.Commands;

/// <summary>
/// <c>exprmodel snapshots export|import|backup|verify</c>: the shared-model store's backups. The store is the web app's
/// snapshot database (<c>--store</c>, else EXPRMODEL_APP_DB, else the default location); every command opens it with the
/// same start-up checks as the app, so a damaged or unwritable store is refused naming the file.
/// </summary>
public static class SnapshotCommands
{
    public static Command Create(CliContext ctx)
    {
        var c = new Command("snapshots", "Back up, export, import and verify the shared-model store.");
        c.Subcommands.Add(Export(ctx));
        c.Subcommands.Add(Import(ctx));
        c.Subcommands.Add(Backup(ctx));
        c.Subcommands.Add(Verify(ctx));
        return c;
    }

    private static Option<string?> StoreOption() =>
        new("--store") { Description = "Snapshot database (default: EXPRMODEL_APP_DB, else the app's default location)." };

    private static SnapshotStore Open(string? path) => SnapshotStore.Open(path ?? SnapshotStore.DefaultPath());

    private static Command Export(CliContext ctx)
    {
        var c = new Command("export", "Write every shared model with its SHA-256 checksum to one JSON file (verified while reading).");
        var file = new Argument<string>("file") { Description = "Export file to write (replaced atomically)." };
        var store = StoreOption();
        c.Arguments.Add(file);
        c.Options.Add(store);
        c.SetAction(p =>
        {
            var s = Open(p.GetValue(store));
            var all = s.All();
            SnapshotArchive.Write(p.GetValue(file)!, all);
            ctx.Error.WriteLine($"exported {all.Count} snapshots from {s.DatabasePath} to {p.GetValue(file)}");
            return 0;
        });
        return c;
    }

    private static Command Import(CliContext ctx)
    {
        var c = new Command("import", "Add the snapshots of an export file; every checksum is verified and nothing is written unless all are accepted.");
        var file = new Argument<string>("file") { Description = "Export file written by 'exprmodel snapshots export'." };
        var store = StoreOption();
        c.Arguments.Add(file);
        c.Options.Add(store);
        c.SetAction(p =>
        {
            var snapshots = SnapshotArchive.Read(p.GetValue(file)!);
            var s = Open(p.GetValue(store));
            var (added, already) = s.Import(snapshots);
            ctx.Out.WriteLine($"imported {added} snapshots into {s.DatabasePath}; {already} were already stored");
            return 0;
        });
        return c;
    }

    private static Command Backup(CliContext ctx)
    {
        var c = new Command("backup", "Copy the store with SQLite's online backup (safe while the web app runs).");
        var file = new Argument<string>("file") { Description = "Backup database to write (replaced only when the copy is complete and checked)." };
        var store = StoreOption();
        c.Arguments.Add(file);
        c.Options.Add(store);
        c.SetAction(p =>
        {
            var s = Open(p.GetValue(store));
            s.Backup(p.GetValue(file)!);
            ctx.Error.WriteLine($"backed up {s.DatabasePath} to {p.GetValue(file)}");
            return 0;
        });
        return c;
    }

    private static Command Verify(CliContext ctx)
    {
        var c = new Command("verify", "Check the store's file (integrity_check) and every snapshot against its checksum; exit 1 on any problem.");
        var store = StoreOption();
        c.Options.Add(store);
        c.SetAction(p =>
        {
            var check = Open(p.GetValue(store)).Verify();
            foreach (var problem in check.Problems) ctx.Error.WriteLine($"error: {problem}");
            ctx.Out.WriteLine($"{check.DatabasePath}: {check.Checked} snapshots checked, {check.Problems.Count} problems");
            return check.Sound ? 0 : 1;
        });
        return c;
    }
}
