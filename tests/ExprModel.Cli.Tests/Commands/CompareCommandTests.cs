using ExprModel.Core.Models;
using ExprModel.Data.Catalog;

namespace ExprModel.Cli.Tests.Commands;

public sealed class CompareCommandTests : IDisposable
{
    private readonly string _dir = Directory.CreateTempSubdirectory("exprmodel-compare-").FullName;
    public void Dispose() => Directory.Delete(_dir, recursive: true);

    private static string Demo(string file) => Path.Combine(CatalogLocator.FindSourceDirectory()!, "demo", file);
    private static string[] Inputs => ["--expression", Demo("counts.csv"), "--metadata", Demo("metadata.csv"), "--group-by", "group"];

    private string Write(string name, string text)
    {
        var path = Path.Combine(_dir, name);
        File.WriteAllText(path, text);
        return path;
    }

    [Fact]
    public void GroupModelsAgainstTheDemoRecordingsWriteTheTableAndASummary()
    {
        var path = Path.Combine(_dir, "compare.csv");
        var (exit, output, err) = CliRunner.Run(["compare", .. Inputs, "--per", "group", "--out", path]);
        Assert.True(exit == 0, err);
        // The match report names every column and why the maximum rate is not compared.
        Assert.Contains("match: 'rheobase (pA)' -> rheobase_absolute", err);
        Assert.Contains("not compared: 'max firing rate (Hz)'", err);
        // The summary: one row per matched read-out with n, r, Spearman r, MAE and bias.
        Assert.Contains("pearson r", output);
        Assert.Contains("resting_potential", output);
        Assert.Contains(ResearchCaution.Text, output);
        var lines = File.ReadAllLines(path);
        Assert.Equal("# " + ResearchCaution.Text, lines[0]);
        Assert.Contains(lines, l => l.StartsWith("# column 7 'max firing rate (Hz)': not compared:"));
        var rows = lines.Where(l => !l.StartsWith('#')).ToArray();
        Assert.StartsWith("cell,group,model,readout,unit,predicted,recorded", rows[0]);
        // FH1001 (T1-fast) was recorded at rheobase 167.0 pA (metadata.csv) and is predicted by its group's model.
        var fh1001 = rows.Single(r => r.StartsWith("FH1001,") && r.Contains(",rheobase_absolute,"));
        Assert.Contains(",group T1-fast,", fh1001);
        Assert.Contains(",167,", fh1001);
        Assert.Equal(3, rows.Count(r => r.StartsWith("all cells,")));
        Assert.Equal(15, rows.Count(r => r.StartsWith("group mean,")));
    }

    [Fact]
    public void PerCellModelsShrinkByDefaultAndCanBeAskedNotTo()
    {
        // Four recorded T1-fast cells in a separate file, one of them with the rheobase in nA.
        var recorded = Write("recorded.tsv", "cell\tVrest (mV)\trheobase (nA)\n" +
            "FH1001\t-71.3\t0.167\nFH1002\t-68.7\t0.1632\nFH1003\t-62.8\t\nFH1004\t-69.6\t0.1201\n");
        var shrunk = Path.Combine(_dir, "shrunk.csv");
        var a = CliRunner.Run(["compare", .. Inputs, "--recorded", recorded, "--map", "Vrest (mV)=resting_potential", "--out", shrunk]);
        Assert.True(a.Exit == 0, a.Err);
        Assert.Contains("shrunk towards each cell's group", a.Err);
        var rows = File.ReadAllLines(shrunk).Where(l => !l.StartsWith('#')).ToArray();
        Assert.Equal(3, rows.Count(r => r.Contains(",rheobase_absolute,") && !r.StartsWith("all cells") && !r.StartsWith("group mean")));
        Assert.Contains(rows, r => r.StartsWith("FH1001,T1-fast,FH1001,rheobase_absolute,pA,") && r.Contains(",167,"));
        Assert.Contains(File.ReadAllLines(shrunk), l => l.StartsWith("# per-cell expression shrunk"));

        var plain = Path.Combine(_dir, "plain.csv");
        var b = CliRunner.Run(["compare", .. Inputs, "--recorded", recorded, "--map", "Vrest=resting_potential", "--shrink", "none", "--out", plain]);
        Assert.True(b.Exit == 0, b.Err);
        Assert.Contains(File.ReadAllLines(plain), l => l.StartsWith("# per-cell expression as read"));
    }

    [Theory]
    [InlineData("cell,input resistance (mOhm)\nFH1001,120\n", "line 1, column 2: unknown unit 'mOhm'")]
    [InlineData("cell,rheobase (pA)\nFH1001,120\nFH1002,n/a?\n", "line 3, column 2: 'n/a?'")]
    [InlineData("cell,rheobase (pA)\nFH1001,120\nXX9999,80\n", "line 3, column 1: cell 'XX9999'")]
    [InlineData("cell,notes\nFH1001,fine\n", "no column matched a read-out")]
    public void BadRecordedTablesAreErrorsThatSayWhere(string table, string expected)
    {
        var (exit, _, err) = CliRunner.Run(["compare", .. Inputs, "--recorded", Write("bad.csv", table), "--per", "group"]);
        Assert.NotEqual(0, exit);
        Assert.Contains(expected, err);
        Assert.Contains("bad.csv", err);
    }

    [Fact]
    public void BadOptionsNameTheOption()
    {
        Assert.Contains("--per: 'cells'", CliRunner.Run(["compare", .. Inputs, "--per", "cells"]).Err);
        Assert.Contains("--shrink: 'nearest'", CliRunner.Run(["compare", .. Inputs, "--shrink", "nearest"]).Err);
        Assert.Contains("--map 'rheobase'", CliRunner.Run(["compare", .. Inputs, "--map", "rheobase"]).Err);
        Assert.Contains("no read-out 'rate'", CliRunner.Run(["compare", .. Inputs, "--map", "max firing rate (Hz)=rate"]).Err);
    }
    [Fact]
    public void RecordedSweepsBesideATable_TheSweepsWinAndEveryRowNamesItsSource()
    {
        // Two demo recordings (FH1001, FH2002) and a table with FH1001 and a cell without sweeps (FH1004).
        var sweeps = Directory.CreateDirectory(Path.Combine(_dir, "sweeps")).FullName;
        foreach (var id in new[] { "FH1001", "FH2002" }) File.Copy(Demo(Path.Combine("recordings", id + ".nwb")), Path.Combine(sweeps, id + ".nwb"));
        var table = Write("table.csv", "cell_id,input resistance (MOhm)\nFH1001,115.6\nFH1004,120\n");
        var path = Path.Combine(_dir, "compare.csv");
        var (exit, _, err) = CliRunner.Run(["compare", .. Inputs, "--recordings", sweeps, "--recorded", table, "--shrink", "none", "--out", path]);
        Assert.True(exit == 0, err);
        Assert.Contains("match: 'input_resistance (MOhm), from the sweeps' -> input_resistance", err);
        Assert.Contains("not compared: 'first_spike_latency (ms), from the sweeps'", err);
        var rows = File.ReadAllLines(path).Where(l => !l.StartsWith('#')).ToArray();
        var fh1001 = rows.Single(r => r.StartsWith("FH1001,") && r.Contains(",input_resistance,"));
        // The demo recording of FH1001 measures 270.8 MOhm (catalog/demo/recorded-features.csv); the table's 115.6 is noted.
        Assert.Contains(",270.78", fh1001);
        Assert.Contains("recorded: sweeps FH1001.nwb.", fh1001);
        Assert.Contains("gives 115.6 MOhm", fh1001);
        var fh1004 = rows.Single(r => r.StartsWith("FH1004,") && r.Contains(",input_resistance,"));
        Assert.Contains(",120,", fh1004);
        Assert.Contains("recorded: table table.csv, column 'input resistance (MOhm)'.", fh1004);
        Assert.Contains(rows, r => r.StartsWith("FH2002,") && r.Contains(",rheobase_absolute,") && r.Contains("sweeps FH2002.nwb"));
    }

    [Fact]
    public void RecordingsOfACellNotInTheExpressionTableAreAnErrorNamingTheFile()
    {
        var sweeps = Directory.CreateDirectory(Path.Combine(_dir, "sweeps")).FullName;
        File.Copy(Demo(Path.Combine("recordings", "FH1001.nwb")), Path.Combine(sweeps, "FH1001.nwb"));
        var expression = Write("two.csv", "gene,c1,c2\nScn1a,10,12\nKcnc1,5,6\n");
        var (exit, _, err) = CliRunner.Run(["compare", "--expression", expression, "--unit", "cpm", "--recordings", sweeps]);
        Assert.NotEqual(0, exit);
        Assert.Contains("FH1001.nwb: recorded cell 'FH1001' is not in the expression table", err);
    }
}
