using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Models;

namespace ExprModel.Core.Tests.Export;

public class ClampCsvTests
{
    [Fact]
    public void The_table_has_the_caution_one_row_per_command_and_four_columns_per_channel()
    {
        var cell = TestCatalog.Preset("hh1952");
        var curves = ClampFamilies.Measure(cell, new ClampProtocol { FromMv = -60, ToMv = 0, IncrementMv = 20, CommandMs = 10, ConditioningMs = 50 });
        var lines = ClampCsv.Write("hh", curves, CurrentUnit.Pa, cell.Model.Geometry).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.StartsWith("# " + ResearchCaution.Text[..20], lines[0]);
        var header = lines.First(l => !l.StartsWith('#')).Split(',');
        Assert.Equal(1 + 4 * curves.Channels.Count, header.Length);
        Assert.Contains(header, h => h.StartsWith("inactivation_", StringComparison.Ordinal));
        Assert.Equal(4, lines.Count(l => !l.StartsWith('#')) - 1);
        // 1 uA/cm2 on 1000 um2 is 10 pA (DOMAIN.md units): the first channel's peak at -60 mV in pA.
        var row = lines.Last(l => l.StartsWith("-60", StringComparison.Ordinal)).Split(',');
        Assert.Equal(curves.PeakUaPerCm2[curves.Channels[0]][0] * 10, double.Parse(row[1], System.Globalization.CultureInfo.InvariantCulture), 9);
    }
}
