using System.Globalization;
using ExprModel.Core.Models;

namespace ExprModel.Cli.Tests.Commands;

public class WhatIfCommandsTests
{
    [Fact]
    public void Knockdown_csv_ranks_the_channels_that_set_the_rheobase_and_carries_the_caution()
    {
        var (exit, stdout, err) = CliRunner.Run("knockdown", "--preset", "cortex-rs2008", "--level", "0", "--readout", "rheobase", "--format", "csv");
        Assert.True(exit == 0, err);
        Assert.Contains("Research tool", stdout);
        var rows = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries).Where(l => !l.StartsWith('#')).Skip(1).Select(l => l.Split(',')).ToArray();
        Assert.Equal(4, rows.Length);
        Assert.All(rows, r => Assert.Equal("rheobase", r[0]));
        // Common practice: no sodium, no spike; a read-out that is lost ranks before finite changes.
        Assert.Contains(rows.TakeWhile(r => r[8] == "1"), r => r[2] == "traub-na");
    }

    [Fact]
    public void Sensitivity_writes_channels_by_readouts()
    {
        var dir = Directory.CreateTempSubdirectory("exprmodel-whatif-").FullName;
        var path = Path.Combine(dir, "s.csv");
        var (exit, _, err) = CliRunner.Run("sensitivity", "--preset", "wb1996", "--out", path);
        Assert.True(exit == 0, err);
        var text = File.ReadAllText(path);
        Assert.Contains("Research tool", text);
        var lines = text.Split('\n', StringSplitOptions.RemoveEmptyEntries).Where(l => !l.StartsWith('#')).ToArray();
        Assert.StartsWith("channel,resting_potential,input_resistance", lines[0]);
        Assert.StartsWith("unit,mV per unit ln(density)", lines[1]);
        Assert.Equal(["wb-na-1996", "wb-k-1996", "leak"], lines.Skip(2).Select(l => l.Split(',')[0]));
        // Common practice: more leak, lower input resistance. (Not bounded by -1 here: leak also moves rest, and with it the
        // active channels' share of the resting conductance.)
        int col = Array.IndexOf(lines[0].Split(','), "input_resistance");
        Assert.True(double.Parse(lines[4].Split(',')[col], CultureInfo.InvariantCulture) < -0.05);
    }

    [Fact]
    public void Fit_from_a_targets_file_writes_a_model_whose_derivation_records_the_fit()
    {
        var dir = Directory.CreateTempSubdirectory("exprmodel-whatif-").FullName;
        var targets = Path.Combine(dir, "targets.csv");
        File.WriteAllText(targets, "readout,value,unit,scale\nrheobase,0.2,uA/cm2,0.01\nresting_potential,-64,mV,\n");
        var model = Path.Combine(dir, "fitted.json");
        var (exit, stdout, err) = CliRunner.Run("fit", "--preset", "wb1996", "--targets", targets, "--starts", "1", "--seed", "5", "--out", model);
        Assert.True(exit == 0, err);
        Assert.Contains("Expression alone misses the 2 recorded read-out(s)", stdout);
        Assert.Contains("singular_value", stdout);
        var doc = ModelDocument.Parse(File.ReadAllText(model), model);
        Assert.Equal(5, doc.Derivation!["fit"]!["seed"]!.GetValue<int>());
        Assert.Equal(ResearchCaution.Text, doc.Caution);
    }

    [Theory]
    [InlineData("--target", "rheobse=1", "'rheobse' is not a read-out")]
    [InlineData("--prior-width", "0.5", "--target NAME=VALUE")]
    public void Fit_input_errors_name_the_problem(string option, string value, string expected)
    {
        var (exit, _, err) = CliRunner.Run("fit", "--preset", "wb1996", option, value);
        Assert.Equal(1, exit);
        Assert.Contains(expected, err);
    }

    [Fact]
    public void Gene_knockdown_of_a_preset_says_it_needs_a_built_model()
    {
        var (exit, _, err) = CliRunner.Run("knockdown", "--preset", "wb1996", "--genes");
        Assert.Equal(1, exit);
        Assert.Contains("built from expression", err);
    }
    [Fact]
    public void Fit_to_a_groups_recorded_mean_uses_its_recorded_sd_as_the_scale()
    {
        var dir = Directory.CreateTempSubdirectory("exprmodel-fit-rec-").FullName;
        try
        {
            var table = Path.Combine(dir, "recorded.csv");
            File.WriteAllText(table, "cell,group,resting potential (mV)\na1,A,-66\na2,A,-64\na3,A,-65\nb1,B,-70\n");
            var (exit, stdout, err) = CliRunner.Run("fit", "--preset", "wb1996", "--recorded", table, "--group", "A", "--starts", "1");
            Assert.True(exit == 0, err);
            // Mean -65 mV, sample SD of -66, -64, -65 = 1 mV.
            Assert.Contains("target: resting_potential: mean of 3 cells -65 mV, scale their SD 1.", err);
            Assert.Contains(Core.Models.ResearchCaution.Text, stdout);
            Assert.Matches(@"resting_potential\s+mV\s+-65\s+1\s", stdout);

            var (exit2, _, err2) = CliRunner.Run("fit", "--preset", "wb1996", "--recorded", table, "--cell", "zz", "--starts", "1");
            Assert.NotEqual(0, exit2);
            Assert.Contains("no recorded values for cell 'zz'", err2);
            var (exit3, _, err3) = CliRunner.Run("fit", "--preset", "wb1996", "--recorded", table, "--target", "rheobase=1uA/cm2");
            Assert.NotEqual(0, exit3);
            Assert.Contains("one way", err3);
        }
        finally { Directory.Delete(dir, true); }
    }
}
