using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Models;

namespace ExprModel.Core.Tests.Export;

public class FiCsvTests
{
    private static readonly FiPoint[] Points = [new(0, 0, 0, 0, 0, null), new(2, 3, 6, 10, 5, 12.5)];

    [Fact]
    public void CautionModelHeaderThenOneRowPerAmplitude()
    {
        var lines = FiCsv.Write("m", Points).Split('\n');
        Assert.Equal("# " + ResearchCaution.Text, lines[0]);
        Assert.Equal("# model: m", lines[1]);
        Assert.Equal("amplitude_ua_per_cm2,spike_count,whole_step_rate_hz,first_isi_rate_hz,late_rate_hz,first_spike_latency_ms", lines[2]);
        Assert.Equal("0,0,0,0,0,", lines[3]);
        Assert.Equal("2,3,6,10,5,12.5", lines[4]);
    }

    [Fact]
    public void AmplitudesInPicoampsUseTheCellArea()
    {
        // 1 uA/cm2 on 1000 um2 (1e-5 cm2) is 1e-5 uA = 10 pA (unit identity).
        var lines = FiCsv.Write("m", Points, CurrentUnit.Pa, new Geometry { AreaUm2 = 1000 }).Split('\n');
        Assert.StartsWith("amplitude_pa,", lines[2]);
        Assert.StartsWith("20,3,", lines[4]);
        Assert.Throws<ArgumentException>(() => FiCsv.Write("m", Points, CurrentUnit.Na));
    }
}
