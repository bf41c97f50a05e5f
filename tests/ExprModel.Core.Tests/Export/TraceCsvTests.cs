using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Models;

namespace ExprModel.Core.Tests.Export;

public class TraceCsvTests
{
    [Fact]
    public void CautionModelSpikeCountThenSamples()
    {
        var csv = TraceCsv.Write("m", [0, 0.1000000004], [-65, -64.5], [0, 5], 2);
        var lines = csv.Split('\n');
        Assert.Equal("# " + ResearchCaution.Text, lines[0]);
        Assert.Equal("# model: m", lines[1]);
        Assert.Equal("# spikes: 2", lines[2]);
        Assert.Equal("time_ms,voltage_mv,stimulus_ua_per_cm2", lines[3]);
        Assert.Equal("0,-65,0", lines[4]);
        // Times are rounded to 1e-6 ms: accumulated step sums carry round-off below that.
        Assert.Equal("0.1,-64.5,5", lines[5]);
    }

    [Fact]
    public void StimulusInNanoampsAndChannelCurrents()
    {
        // 5 uA/cm2 on 1000 um2 is 50 pA = 0.05 nA (unit identity).
        var currents = new Dictionary<string, double[]> { ["na"] = [-1, -2], ["k"] = [3, 4] };
        var lines = TraceCsv.Write("m", [0, 1], [-65, -64], [5, 5], 0, CurrentUnit.Na, new Geometry { AreaUm2 = 1000 }, currents).Split('\n');
        Assert.Equal("time_ms,voltage_mv,stimulus_na,current_na_ua_per_cm2,current_k_ua_per_cm2", lines[3]);
        Assert.Equal("1,-64,0.05,-2,4", lines[5]);
    }
}
