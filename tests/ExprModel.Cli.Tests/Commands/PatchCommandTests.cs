using System.Globalization;

namespace ExprModel.Cli.Tests.Commands;

public class PatchCommandTests
{
    [Fact]
    public void Patch_writes_the_caution_the_unitary_conductance_and_one_row_per_sample()
    {
        var (exit, output, err) = CliRunner.Run("patch", "squid-k-hh1952", "--channels", "5", "--sweeps", "20", "--before", "1", "--duration", "4",
            "--sample", "0.5", "--keep", "2", "--step", "20");
        Assert.True(exit == 0, err);
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Contains("Research tool", lines[0]);
        Assert.Contains(lines, l => l.StartsWith("# unitary conductance: 20 pS (entry;", StringComparison.Ordinal));
        var header = lines.First(l => !l.StartsWith('#'));
        Assert.Equal("time_ms,command_mv,mean_pa,variance_pa2,standard_error_pa,deterministic_pa,sweep_1_pa,sweep_2_pa", header);
        var rows = lines.SkipWhile(l => l != header).Skip(1).ToArray();
        Assert.Equal(11, rows.Length);
        Assert.Equal(20, double.Parse(rows[^1].Split(',')[1], CultureInfo.InvariantCulture));
    }

    [Fact]
    public void Bad_options_are_errors_naming_the_option()
    {
        var (exit, _, err) = CliRunner.Run("patch", "squid-k-hh1952", "--channels", "20000");
        Assert.Equal(1, exit);
        Assert.Contains("channels", err);
        (exit, _, err) = CliRunner.Run("patch", "no-such-entry");
        Assert.Equal(1, exit);
        Assert.Contains("no-such-entry", err);
    }
}
