using System.CommandLine;
using ExprModel.Cli.Commands;
using ExprModel.Core.Expression;
using ExprModel.Core.Models;
using ExprModel.Core.Simulation;
using ExprModel.Data.Catalog;
using ExprModel.Data.Store;

namespace ExprModel.Cli;

/// <summary>The exprmodel command line: one root with a sub-command per task; errors go to stderr with a non-zero exit.</summary>
public static class CliApp
{
    public static int Run(string[] args, TextWriter stdout, TextWriter stderr)
    {
        var ctx = new CliContext(stdout, stderr);
        var root = new RootCommand("exprmodel: predict firing from ion-channel gene expression with conductance-based single-compartment models.");
        root.Subcommands.Add(CatalogCommands.Create(ctx));
        foreach (var c in ModelCommands.Create(ctx)) root.Subcommands.Add(c);
        foreach (var c in ExpressionCommands.Create(ctx)) root.Subcommands.Add(c);
        foreach (var c in WhatIfCommands.Create(ctx)) root.Subcommands.Add(c);
        root.Subcommands.Add(CompareCommand.Create(ctx));
        root.Subcommands.Add(RecordingCommands.Create(ctx));
        root.Subcommands.Add(SnapshotCommands.Create(ctx));
        root.Subcommands.Add(PatchCommand.Create(ctx));
        root.Subcommands.Add(NoiseCommand.Create(ctx));
        root.Subcommands.Add(SlurmCommand.Create(ctx));
        var parse = root.Parse(args);
        if (parse.Errors.Count > 0)
        {
            foreach (var e in parse.Errors) stderr.WriteLine($"error: {e.Message}");
            return 2;
        }
        try
        {
            return parse.Invoke(new InvocationConfiguration { Output = stdout, Error = stderr, EnableDefaultExceptionHandler = false });
        }
        catch (Exception e) when (e is CatalogException or ModelFileException or ModelException or SimulationBlowUpException
            or ExpressionFormatException or CliException or ArgumentException or IOException or UnauthorizedAccessException
            or SnapshotException or SnapshotStoreException)
        {
            stderr.WriteLine($"error: {e.Message}");
            return 1;
        }
    }
}
